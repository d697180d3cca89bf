import { Link } from "react-router-dom";
import type { EstimateFinding } from "../../../../shared/schemas/estimates";
import { cn } from "../../../utils/cn";
import { priceListAddHref } from "../lib/format";

/** What stops the quote (errors) and what to look at (warnings), errors first; a missing price links to the price list's add form. */
export function FindingsList({ findings, canAddPrices }: { findings: EstimateFinding[]; canAddPrices: boolean }) {
  if (findings.length === 0) return null;
  const ordered = [...findings.filter((f) => f.severity === "error"), ...findings.filter((f) => f.severity !== "error")];
  const errors = ordered.filter((f) => f.severity === "error").length;
  const warnings = ordered.length - errors;
  return (
    <section aria-labelledby="findings-heading" className="space-y-2">
      <h2 id="findings-heading" className="text-base font-semibold text-ink-900">
        Checks
        <span className="ml-2 text-sm font-normal text-ink-500">
          {[errors ? `${errors} to fix before quoting` : null, warnings ? `${warnings} ${warnings === 1 ? "warning" : "warnings"}` : null].filter(Boolean).join(" · ")}
        </span>
      </h2>
      <ul aria-label="Checks" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white text-sm">
        {ordered.map((finding, i) => {
          const isError = finding.severity === "error";
          return (
            <li key={`${finding.code}-${i}`} className="flex flex-wrap items-start gap-x-3 gap-y-1 px-3 py-2">
              <span className={cn("inline-flex w-20 shrink-0 items-center gap-1 text-xs font-semibold uppercase tracking-wide", isError ? "text-over-700" : "text-near-700")}>
                <span aria-hidden="true">{isError ? "✕" : "!"}</span>
                {isError ? "To fix" : "Warning"}
              </span>
              <span className="min-w-0 flex-1 text-ink-800">{finding.message}</span>
              {finding.code === "MISSING_PRICE" && finding.need && canAddPrices ? (
                <Link to={priceListAddHref(finding.need)} className="shrink-0 text-sm font-medium text-copper-700 underline underline-offset-2 hover:text-copper-900">
                  Add to price list
                </Link>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}
