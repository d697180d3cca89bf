import { useRef, useState } from "react";
import type { SystemRecord } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { secondaryButtonClass } from "../../../components/ui/form";
import { conflictDetails } from "../../systems/api/save-system";
import { csvRowErrors, formatCsvRowError, runsCsvHref, useImportRunsCsv } from "../../systems/api/runs-csv";

export interface RunsCsvControlsProps {
  systemId: string;
  version: number;
  /** May import (the link to export is for everyone). */
  canImport: boolean;
  /** Local edits that an import (which saves the server's copy with new runs) would drop. */
  dirty: boolean;
  onImported(record: SystemRecord): void;
}

/** "Export runs CSV" (the saved runs) and "Import runs CSV" (replaces the runs and saves). */
export function RunsCsvControls({ systemId, version, canImport, dirty, onImported }: RunsCsvControlsProps) {
  const input = useRef<HTMLInputElement>(null);
  const importCsv = useImportRunsCsv();
  const [asking, setAsking] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const [error, setError] = useState<{ message: string; rows: string[] } | null>(null);

  const pick = () => {
    setAsking(false);
    input.current?.click();
  };
  const upload = (file: File) => {
    setMessage(null);
    setError(null);
    importCsv.mutate(
      { systemId, file, version },
      {
        onSuccess: (record) => {
          onImported(record);
          const runs = Array.isArray(record.document.runs) ? record.document.runs.length : 0;
          setMessage(`Imported ${runs} ${runs === 1 ? "run" : "runs"} from ${file.name}; saved as version ${record.version}.`);
        },
        onError: (failure) => {
          const rows = csvRowErrors(failure).map(formatCsvRowError);
          const conflict = conflictDetails(failure);
          setError({
            message: conflict ? `This system was changed by someone else (${conflict.updatedBy ?? "another user"}); reload it before importing.` : failure.message,
            rows,
          });
        },
      },
    );
  };

  return (
    <div className="flex flex-wrap items-center gap-2">
      <a href={runsCsvHref(systemId)} download className={secondaryButtonClass} title="Downloads the runs as last saved">
        Export runs CSV
      </a>
      {canImport ? (
        <>
          <button type="button" disabled={importCsv.isPending} onClick={() => (dirty ? setAsking(true) : pick())} className={secondaryButtonClass}>
            {importCsv.isPending ? "Importing…" : "Import runs CSV"}
          </button>
          <input
            ref={input}
            type="file"
            accept=".csv,text/csv"
            aria-label="Runs CSV file"
            className="sr-only"
            tabIndex={-1}
            onChange={(event) => {
              const file = event.target.files?.[0];
              event.target.value = "";
              if (file) upload(file);
            }}
          />
        </>
      ) : null}
      {message ? (
        <p role="status" className="basis-full text-sm text-within-700">
          {message}
        </p>
      ) : null}
      {error ? (
        <div role="alert" className="basis-full rounded-md border border-over-100 bg-over-50 px-3 py-2 text-sm text-over-700">
          <p className="font-semibold">The CSV was not imported: {error.message}</p>
          {error.rows.length > 0 ? (
            <ul className="mt-1 list-disc space-y-0.5 pl-5">
              {error.rows.map((row) => (
                <li key={row}>{row}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      {asking ? (
        <ConfirmDialog title="Import runs and drop unsaved changes?" confirmLabel="Choose a CSV file" onConfirm={pick} onCancel={() => setAsking(false)}>
          Importing replaces the saved runs with the file's and saves the system. Your unsaved changes here will be lost; save first to keep them.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
