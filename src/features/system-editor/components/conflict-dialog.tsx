import type { z } from "zod";
import type { SystemConflictDetails } from "../../../../shared/schemas/jobs";
import { Dialog } from "../../../components/ui/dialog";
import { primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";

const when = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });
const formatWhen = (iso: string) => {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : when.format(date);
};

export interface ConflictDialogProps {
  details: z.infer<typeof SystemConflictDetails>;
  pending: "reload" | "overwrite" | null;
  error?: string | null;
  onReload(): void;
  onOverwrite(): void;
  onClose(): void;
}

/** The 409 of a stale save: take their version or put mine over it. */
export function ConflictDialog({ details, pending, error, onReload, onOverwrite, onClose }: ConflictDialogProps) {
  return (
    <Dialog
      title="This system was changed by someone else"
      onClose={onClose}
      busy={pending !== null}
      footer={
        <>
          <button type="button" onClick={onReload} disabled={pending !== null} className={secondaryButtonClass}>
            {pending === "reload" ? "Reloading…" : "Reload their version"}
          </button>
          <button type="button" onClick={onOverwrite} disabled={pending !== null} className={primaryButtonClass}>
            {pending === "overwrite" ? "Saving…" : "Overwrite with mine"}
          </button>
        </>
      }
    >
      <p>
        {details.updatedBy ?? "Someone"} saved it on {formatWhen(details.updatedAt)} (version {details.currentVersion}), after you opened it.
      </p>
      <p className="mt-2">Reload their version to drop your changes here, or overwrite theirs with yours.</p>
      {error ? <p className="mt-2 font-medium text-over-700">{error}</p> : null}
    </Dialog>
  );
}
