import { useRef, useState } from "react";
import type { PriceImportPreview } from "../../../../shared/schemas/estimates";
import { Dialog } from "../../../components/ui/dialog";
import { primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { csvRowErrors, formatCsvRowError } from "../../systems/api/runs-csv";
import { useImportPriceList } from "../api/import-price-list";
import { fieldWords } from "./price-item-text";

export interface ImportRefusal {
  message: string;
  rows: string[];
}

/** What the screen says under its toolbar once an import is done or refused. */
export type ImportNotice = { kind: "done"; text: string } | { kind: "refused"; refusal: ImportRefusal };

const refusalOf = (failure: Error): ImportRefusal => ({ message: failure.message, rows: csvRowErrors(failure).map(formatCsvRowError) });

/** The bad rows of a refused file, one line each ("Line 4, column unit_cost: …"). */
export function RefusedRows({ refusal, title }: { refusal: ImportRefusal; title: string }) {
  return (
    <div role="alert" className="rounded-md border border-over-100 bg-over-50 px-3 py-2 text-sm text-over-700">
      <p className="font-semibold">
        {title}: {refusal.message}
      </p>
      {refusal.rows.length > 0 ? (
        <ul aria-label="Rows with problems" className="mt-1 list-disc space-y-0.5 pl-5">
          {refusal.rows.map((row) => (
            <li key={row}>{row}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/**
 * "Import CSV": the chosen file is first sent for a preview (nothing is saved), the preview says
 * what it would add and change, and only "Apply import" sends it again to be written.
 */
export function PriceListImport({ onNotice }: { onNotice: (notice: ImportNotice | null) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const preview = useImportPriceList();
  const apply = useImportPriceList();
  const [pending, setPending] = useState<{ file: File; preview: PriceImportPreview } | null>(null);
  const [applyRefusal, setApplyRefusal] = useState<ImportRefusal | null>(null);

  const choose = (file: File) => {
    onNotice(null);
    preview.mutate(
      { file, apply: false },
      {
        onSuccess: (result) => {
          setApplyRefusal(null);
          setPending({ file, preview: result });
        },
        onError: (failure) => onNotice({ kind: "refused", refusal: refusalOf(failure) }),
      },
    );
  };

  const confirm = () => {
    if (!pending) return;
    const { file } = pending;
    setApplyRefusal(null);
    apply.mutate(
      { file, apply: true },
      {
        onSuccess: (result) => {
          setPending(null);
          onNotice({
            kind: "done",
            text: `Imported ${file.name}: ${plural(result.added.length, "item", "items")} added, ${plural(result.changed.length, "item", "items")} changed, ${result.unchanged} unchanged.`,
          });
        },
        onError: (failure) => setApplyRefusal(refusalOf(failure)),
      },
    );
  };

  const result = pending?.preview;
  const nothingToDo = result ? result.added.length === 0 && result.changed.length === 0 : false;

  return (
    <>
      <button type="button" disabled={preview.isPending} onClick={() => input.current?.click()} className={secondaryButtonClass}>
        {preview.isPending ? "Reading CSV…" : "Import CSV"}
      </button>
      <input
        ref={input}
        type="file"
        accept=".csv,text/csv"
        aria-label="Price list CSV file"
        className="sr-only"
        tabIndex={-1}
        onChange={(event) => {
          const file = event.target.files?.[0];
          event.target.value = "";
          if (file) choose(file);
        }}
      />
      {pending && result ? (
        <Dialog
          size="lg"
          title={`Import ${pending.file.name}?`}
          description="Nothing has been saved yet. Check what the file changes, then apply it; every row is written or none is."
          busy={apply.isPending}
          onClose={() => setPending(null)}
          footer={
            <>
              <button type="button" disabled={apply.isPending} onClick={() => setPending(null)} className={secondaryButtonClass}>
                Cancel
              </button>
              <button type="button" disabled={apply.isPending || nothingToDo} onClick={confirm} className={primaryButtonClass}>
                {apply.isPending ? "Apply import…" : "Apply import"}
              </button>
            </>
          }
        >
          <div className="space-y-4">
            {applyRefusal ? <RefusedRows refusal={applyRefusal} title="The import was not applied" /> : null}
            <p className="tabular-nums">
              {plural(result.added.length, "item", "items")} to add, {plural(result.changed.length, "item", "items")} to change, {result.unchanged} unchanged.
            </p>
            {nothingToDo ? <p className="rounded-md border border-ink-100 bg-ink-50 px-3 py-2 text-ink-700">The file matches the price list: there is nothing to import.</p> : null}
            {result.added.length > 0 ? (
              <section aria-label="Items to add">
                <h3 className="text-sm font-semibold text-ink-900">To add</h3>
                <ul className="mt-1 space-y-0.5">
                  {result.added.map((row) => (
                    <li key={row.sku}>
                      <span className="font-medium text-ink-900">{row.sku}</span> — {row.description}
                    </li>
                  ))}
                </ul>
              </section>
            ) : null}
            {result.changed.length > 0 ? (
              <section aria-label="Items to change">
                <h3 className="text-sm font-semibold text-ink-900">To change</h3>
                <ul className="mt-1 space-y-0.5">
                  {result.changed.map((row) => (
                    <li key={row.sku}>
                      <span className="font-medium text-ink-900">{row.sku}</span> — {row.description}:{" "}
                      <span className="text-copper-700">{row.fields.map(fieldWords).join(", ")}</span>
                    </li>
                  ))}
                </ul>
              </section>
            ) : null}
          </div>
        </Dialog>
      ) : null}
    </>
  );
}
