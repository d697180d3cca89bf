import { CAUTIONS } from "../../../../shared/engine/cautions";

/** DESIGN.md §5: always on the screen, before the first solve too. The answer's cautions join the fixed ones. */
export function CautionsPanel({ extra = [] }: { extra?: readonly string[] }) {
  const all = [...new Set([...CAUTIONS, ...extra])];
  return (
    <section aria-labelledby="safety-cautions" className="rounded-lg border border-near-100 bg-near-50 px-4 py-3">
      <h2 id="safety-cautions" className="flex items-center gap-2 text-sm font-semibold text-ink-900">
        <svg viewBox="0 0 16 16" width={16} height={16} aria-hidden="true" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" className="text-near-700">
          <path d="M8 1.8l6.5 12H1.5z" />
          <path d="M8 6.5v3.3M8 11.9v.1" />
        </svg>
        Safety cautions
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-700">
        {all.map((text) => (
          <li key={text}>{text}</li>
        ))}
      </ul>
    </section>
  );
}
