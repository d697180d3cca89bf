import { useHealth } from "../api/get-health";

type Tone = "up" | "down" | "unknown";

function Light({ tone, label }: { tone: Tone; label: string }) {
  const dot = tone === "up" ? "bg-within-500" : tone === "down" ? "bg-over-500" : "bg-ink-400";
  const mark = tone === "up" ? "✓" : tone === "down" ? "✕" : "…";
  return (
    <span className="inline-flex items-center gap-1.5">
      <span aria-hidden="true" className={`inline-block h-2 w-2 rounded-full ${dot}`} />
      <span>
        {label} <span aria-hidden="true">{mark}</span>
        <span className="sr-only">{tone === "up" ? "up" : tone === "down" ? "down" : "checking"}</span>
      </span>
    </span>
  );
}

/** Footer status: is the API reachable, and can it reach its database? Text and icon, not colour alone. */
export function HealthIndicator() {
  const { data, isPending, isError } = useHealth();
  const api: Tone = isPending ? "unknown" : isError ? "down" : "up";
  const db: Tone = isPending ? "unknown" : data?.db === "up" ? "up" : "down";
  const summary = isPending
    ? "Checking the server…"
    : isError
      ? "Server unreachable"
      : data?.db === "up"
        ? "Database up"
        : "Database down";
  return (
    <div role="status" aria-live="polite" aria-label={summary} data-testid="health" className="flex items-center gap-4 text-xs text-ink-500">
      <Light tone={api} label="API" />
      <Light tone={db} label="Database" />
      {data?.version ? <span className="figures">v{data.version}</span> : null}
    </div>
  );
}
