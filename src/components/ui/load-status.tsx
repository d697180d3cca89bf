// A load's status (Within / Near / Over limit) as words and a shape of its own, so it never rests on
// colour alone. The shapes are drawn once, here: the tables, the badges and the one-line diagram share them.
import type { LoadStatus } from "../../../shared/engine/system";
import { cn } from "../../utils/cn";

export type { LoadStatus };

export const LOAD_STATUS_LABELS: Record<LoadStatus, string> = {
  within: "Within limit",
  near: "Near limit",
  over: "Over limit",
};

/** A ring of radius 6.5 round the middle of the 16 × 16 box. */
const RING = "M1.5 8a6.5 6.5 0 1 0 13 0a6.5 6.5 0 1 0 -13 0";

/** The path data of each status in a 16 × 16 box: a tick in a ring, a bar and dot in a triangle, a cross in an octagon. */
export const LOAD_STATUS_PATHS: Record<LoadStatus, readonly string[]> = {
  within: [RING, "M5 8.3l2 2 4-4.3"],
  near: ["M8 1.8l6.5 12H1.5z", "M8 6.5v3.3M8 11.9v.1"],
  over: ["M5.2 1.5h5.6l3.7 3.7v5.6l-3.7 3.7H5.2l-3.7-3.7V5.2z", "M5.7 5.7l4.6 4.6M10.3 5.7l-4.6 4.6"],
};

interface LoadStatusGlyphProps {
  /** null: not solved (a dashed ring). */
  status: LoadStatus | null;
  /** Where the middle of the 16 × 16 mark goes; (8, 8) by default, the middle of its own box. */
  x?: number;
  y?: number;
  /** currentColor by default; a drawing that is exported on its own gives the colour itself. */
  stroke?: string;
  strokeWidth?: number;
}

/** The status mark as SVG children, for drawings (the one-line diagram) and for LoadStatusIcon. */
export function LoadStatusGlyph({ status, x = 8, y = 8, stroke = "currentColor", strokeWidth = 1.8 }: LoadStatusGlyphProps) {
  return (
    <g
      transform={x === 8 && y === 8 ? undefined : `translate(${x - 8},${y - 8})`}
      fill="none"
      stroke={stroke}
      strokeWidth={strokeWidth}
      strokeLinecap="round"
      strokeLinejoin="round"
    >
      {status ? LOAD_STATUS_PATHS[status].map((d) => <path key={d} d={d} />) : <path d={RING} strokeDasharray="2 2" />}
    </g>
  );
}

/** The status mark as an inline icon (hidden from screen readers: the words go beside it). */
export function LoadStatusIcon({ status, size = 16, className }: { status: LoadStatus | null; size?: number; className?: string }) {
  return (
    <svg viewBox="0 0 16 16" width={size} height={size} aria-hidden="true" className={cn("shrink-0", className)}>
      <LoadStatusGlyph status={status} />
    </svg>
  );
}

const STATUS_CLASS: Record<LoadStatus, string> = {
  within: "font-medium text-within-700",
  near: "font-medium text-near-700",
  over: "font-bold text-over-700",
};

/** A load status in words with its icon; null reads "Not solved" (or the given text). */
export function LoadStatusLabel({ status, emptyText = "Not solved", className }: { status: LoadStatus | null; emptyText?: string; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1.5 whitespace-nowrap", status ? STATUS_CLASS[status] : "font-medium text-ink-500", className)}>
      <LoadStatusIcon status={status} />
      {status ? LOAD_STATUS_LABELS[status] : emptyText}
    </span>
  );
}
