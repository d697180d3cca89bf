// Line icons drawn for Runwright (24 × 24, stroke = currentColor).
import type { SVGProps } from "react";

function Icon({ children, ...props }: SVGProps<SVGSVGElement>) {
  return (
    <svg viewBox="0 0 24 24" width="20" height="20" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" {...props}>
      {children}
    </svg>
  );
}

export const GaugeIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <path d="M4 17a8 8 0 1 1 16 0" />
    <path d="M12 17l4-6" />
  </Icon>
);
export const RunIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <circle cx="5" cy="8" r="2" />
    <circle cx="19" cy="8" r="2" />
    <circle cx="5" cy="16" r="2" />
    <circle cx="19" cy="16" r="2" />
    <path d="M7 8h10M7 16h10" />
  </Icon>
);
export const PeopleIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <circle cx="9" cy="8" r="3" />
    <path d="M3 19a6 6 0 0 1 12 0" />
    <path d="M16 5a3 3 0 0 1 0 6M18 19a6 6 0 0 0-3-5" />
  </Icon>
);
export const TagIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <path d="M3 12V4h8l10 10-8 8z" />
    <circle cx="7.5" cy="8.5" r="1.5" />
  </Icon>
);
export const SlidersIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <path d="M4 6h10M18 6h2M4 12h4M12 12h8M4 18h12M20 18h0" />
    <circle cx="16" cy="6" r="2" />
    <circle cx="10" cy="12" r="2" />
    <circle cx="18" cy="18" r="2" />
  </Icon>
);
export const CompassIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <circle cx="12" cy="12" r="9" />
    <path d="M15 9l-2 5-4 1 2-5z" />
  </Icon>
);
/** A crew badge on its lanyard: the team. */
export const BadgeIcon = (p: SVGProps<SVGSVGElement>) => (
  <Icon {...p}>
    <path d="M9 3l3 4 3-4" />
    <rect x="5" y="7" width="14" height="14" rx="2" />
    <circle cx="12" cy="12.5" r="2" />
    <path d="M8.5 18a3.5 3.5 0 0 1 7 0" />
  </Icon>
);
