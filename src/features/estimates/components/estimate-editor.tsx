import { useQueryClient } from "@tanstack/react-query";
import { useMemo, useRef, useState } from "react";
import { useNavigate } from "react-router-dom";
import type { Estimate, LineChange, ManualLine } from "../../../../shared/schemas/estimates";
import { CautionsPanel } from "../../../components/ui/cautions-panel";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { FormAlert, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { formatDate } from "../../../utils/format-date";
import { useCreateQuote } from "../../quotes/api/create-quote";
import { useGenerateEstimate } from "../api/generate-estimate";
import { estimateQueryOptions } from "../api/get-estimate";
import { useEstimateDraft } from "../hooks/use-estimate-draft";
import { NEW_LINE, priceDraft, withOverride, type EstimateDraft } from "../lib/draft";
import { formatPercent } from "../lib/format";
import { ChangesNotice } from "./changes-notice";
import { EstimateHeader } from "./estimate-header";
import { FindingsList } from "./findings-list";
import { LinesTable } from "./lines-table";
import { ManualLineDialog, type ManualLineValues } from "./manual-line-dialog";
import { SaveStatus } from "./save-status";
import { SettingsPanel } from "./settings-panel";
import { SuppliedLoads } from "./supplied-loads";
import { TotalsPanel } from "./totals-panel";

interface EstimateEditorProps {
  jobId: string;
  estimate: Estimate;
  /** quotes:write: edit, rebuild, create quotes. */
  canWrite: boolean;
  /** prices:write: the "Add to price list" links. */
  canAddPrices: boolean;
}

/** Why "Create quote" cannot be pressed now, or null when it can. */
function quoteBlocker(missingPrices: number, state: ReturnType<typeof useEstimateDraft>["state"]): string | null {
  if (state === "conflict") return "Reload the estimate first: someone else changed it.";
  if (missingPrices > 0) {
    return `${missingPrices} ${missingPrices === 1 ? "item has" : "items have"} no price yet. Add ${missingPrices === 1 ? "it" : "them"} to the price list, then rebuild from the layout.`;
  }
  if (state === "failed") return "Your last changes are not saved yet.";
  if (state !== "saved") return "Waiting for your changes to be saved.";
  return null;
}

export function EstimateEditor({ jobId, estimate, canWrite, canAddPrices }: EstimateEditorProps) {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const { draft, state, error, edit, reset, retry } = useEstimateDraft(jobId, estimate);
  const generate = useGenerateEstimate();
  const createQuote = useCreateQuote();
  const [changes, setChanges] = useState<LineChange[] | null>(null);
  const [lineDialog, setLineDialog] = useState<{ line?: ManualLine } | null>(null);
  const [removing, setRemoving] = useState<ManualLine | null>(null);
  const [alert, setAlert] = useState<string | null>(null);
  const [reloading, setReloading] = useState(false);
  const newLines = useRef(0);

  // Saved: the server's figures. Unsaved: the working copy priced the same way, so each change shows at once.
  const priced = useMemo(() => {
    if (state === "saved") return { lines: estimate.lines, totals: estimate.totals, findings: estimate.findings };
    const local = priceDraft(estimate, draft);
    return { lines: local.lines, totals: local.totals, findings: [...estimate.findings.filter((f) => f.code !== "DISCOUNT_CAPPED"), ...local.findings] };
  }, [state, estimate, draft]);

  const missingPrices = priced.findings.filter((f) => f.code === "MISSING_PRICE" && f.severity === "error").length;
  const blocker = quoteBlocker(missingPrices, state);
  const generatedByKey = useMemo(() => new Map(estimate.generated.map((g) => [g.key, g])), [estimate.generated]);
  const unsaved = state === "pending" || state === "saving" || state === "failed";

  const setSettings = (patch: Partial<EstimateDraft>) =>
    edit((d) => ((Object.keys(patch) as Array<keyof EstimateDraft>).every((k) => d[k] === patch[k]) ? d : { ...d, ...patch }));

  const setQuantity = (key: string, quantity: number | null) =>
    edit((d) => {
      const base = generatedByKey.get(key);
      if (!base) return d;
      const current = d.overrides[key]?.quantity ?? base.quantity;
      if (quantity === null || quantity === base.quantity) return d.overrides[key]?.quantity === undefined ? d : { ...d, overrides: withOverride(d.overrides, key, "quantity", null) };
      return quantity === current ? d : { ...d, overrides: withOverride(d.overrides, key, "quantity", quantity) };
    });

  const setMarkup = (key: string, markupPercent: number | null) =>
    edit((d) => {
      const own = d.overrides[key]?.markupPercent;
      if (markupPercent === null) return own === undefined ? d : { ...d, overrides: withOverride(d.overrides, key, "markupPercent", null) };
      const shown = priced.lines.find((l) => l.key === key)?.markupPercent;
      if (markupPercent === (own ?? shown)) return d;
      return { ...d, overrides: withOverride(d.overrides, key, "markupPercent", markupPercent) };
    });

  const resetLine = (key: string) =>
    edit((d) => {
      if (!(key in d.overrides)) return d;
      const overrides = { ...d.overrides };
      delete overrides[key];
      return { ...d, overrides };
    });

  const saveManual = (values: ManualLineValues) => {
    const editing = lineDialog?.line;
    if (editing) edit((d) => ({ ...d, manual: d.manual.map((m) => (m.id === editing.id ? { ...m, ...values } : m)) }));
    else {
      newLines.current += 1;
      const id = `${NEW_LINE}${newLines.current}`;
      edit((d) => ({ ...d, manual: [...d.manual, { id, ...values }] }));
    }
    setLineDialog(null);
  };

  const chooseDevice = (load: { systemId: string; loadId: string }, priceItemId: string | null) =>
    edit((d) => {
      const others = d.supplied.filter((s) => !(s.systemId === load.systemId && s.loadId === load.loadId));
      return { ...d, supplied: priceItemId ? [...others, { systemId: load.systemId, loadId: load.loadId, priceItemId }] : others };
    });

  const rebuild = () => {
    setAlert(null);
    generate.mutate(jobId, {
      onSuccess: (next) => {
        reset(next);
        setChanges(next.lastChanges);
      },
      onError: (err) => setAlert(`The estimate was not rebuilt. ${err.message}`),
    });
  };

  const reload = async () => {
    setReloading(true);
    try {
      const fresh = await queryClient.fetchQuery({ ...estimateQueryOptions(jobId), staleTime: 0 });
      if (fresh) reset(fresh);
      setAlert(null);
    } catch (err) {
      setAlert(`The estimate could not be reloaded. ${err instanceof Error ? err.message : ""}`);
    } finally {
      setReloading(false);
    }
  };

  const makeQuote = () => {
    setAlert(null);
    createQuote.mutate(
      { jobId },
      {
        onSuccess: (quote) => navigate(paths.quote.getHref(jobId, quote.id)),
        onError: (err) => setAlert(`The quote was not created. ${err.message}`),
      },
    );
  };

  const actions = canWrite ? (
    <>
      <button
        type="button"
        onClick={rebuild}
        disabled={generate.isPending || unsaved}
        title={unsaved ? "Wait for your changes to be saved." : "Recount the lines from the job's saved systems; your own lines, adjustments and supplied loads stay."}
        className={secondaryButtonClass}
      >
        {generate.isPending ? "Rebuilding…" : "Rebuild from the layout"}
      </button>
      <button type="button" onClick={makeQuote} disabled={blocker !== null || createQuote.isPending} aria-describedby={blocker ? "create-quote-blocker" : undefined} className={primaryButtonClass}>
        {createQuote.isPending ? "Creating quote…" : "Create quote"}
      </button>
    </>
  ) : null;

  return (
    <div className="space-y-6">
      <EstimateHeader
        jobId={jobId}
        actions={actions}
        subtitle={estimate.generatedAt ? `Built from the layout on ${formatDate(estimate.generatedAt)}. Prices from your price list.` : "Prices from your price list."}
      />
      <div className="flex flex-wrap items-center justify-between gap-3">
        {canWrite ? <SaveStatus state={state} error={error} onRetry={() => void retry()} /> : <p className="text-sm text-ink-500">Read only: Owners and Estimators change estimates.</p>}
        {canWrite && blocker ? (
          <p id="create-quote-blocker" className="text-sm text-ink-600">
            <span className="font-medium">Create quote is not available:</span> {blocker}
          </p>
        ) : null}
      </div>
      {state === "conflict" ? (
        <div role="alert" className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-over-100 bg-over-50 px-3 py-2 text-sm text-over-700">
          <span>
            <span aria-hidden="true" className="mr-1 font-semibold">
              ✕
            </span>
            This estimate was changed by someone else — reload to see their version. Your changes since the last save are dropped.
          </span>
          <button type="button" onClick={() => void reload()} disabled={reloading} className={secondaryButtonClass}>
            {reloading ? "Reloading…" : "Reload"}
          </button>
        </div>
      ) : null}
      <FormAlert message={alert} />
      {changes ? <ChangesNotice changes={changes} generated={estimate.generated} currency={estimate.currency} onDismiss={() => setChanges(null)} /> : null}
      <FindingsList findings={priced.findings} canAddPrices={canAddPrices} />

      <section aria-labelledby="lines-heading" className="space-y-2">
        <div className="flex flex-wrap items-end justify-between gap-2">
          <div>
            <h2 id="lines-heading" className="text-base font-semibold text-ink-900">
              Lines
            </h2>
            {canWrite ? <p className="text-sm text-ink-500">Change a quantity or markup in place; an adjusted line keeps it when the estimate is rebuilt.</p> : null}
          </div>
          {canWrite ? (
            <button type="button" onClick={() => setLineDialog({})} disabled={state === "conflict"} className={secondaryButtonClass}>
              Add a line
            </button>
          ) : null}
        </div>
        <LinesTable
          lines={priced.lines}
          generated={estimate.generated}
          manual={draft.manual}
          currency={estimate.currency}
          canWrite={canWrite && state !== "conflict"}
          onQuantity={setQuantity}
          onMarkup={setMarkup}
          onReset={resetLine}
          onEditManual={(line) => setLineDialog({ line })}
          onRemoveManual={setRemoving}
        />
      </section>

      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <SuppliedLoads loads={estimate.loads} supplied={draft.supplied} canWrite={canWrite && state !== "conflict"} onChoose={chooseDevice} />
          <SettingsPanel draft={draft} currency={estimate.currency} canWrite={canWrite && state !== "conflict"} onChange={setSettings} />
        </div>
        <div className="space-y-4">
          <TotalsPanel totals={priced.totals} currency={estimate.currency} depositNote={draft.depositMode === "percent" ? formatPercent(draft.depositPercent) : "fixed"} />
          <CautionsPanel />
        </div>
      </div>

      {lineDialog ? (
        <ManualLineDialog line={lineDialog.line} currency={estimate.currency} defaultMarkupPercent={draft.markupPercent} onSave={saveManual} onClose={() => setLineDialog(null)} />
      ) : null}
      {removing ? (
        <ConfirmDialog
          title={`Remove ${removing.description}?`}
          confirmLabel="Remove line"
          onCancel={() => setRemoving(null)}
          onConfirm={() => {
            const id = removing.id;
            edit((d) => ({ ...d, manual: d.manual.filter((m) => m.id !== id) }));
            setRemoving(null);
          }}
        >
          The line leaves this estimate; quotes already made keep it.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
