import { FormAlert, secondaryButtonClass } from "./form";
import { cn } from "../../utils/cn";

/** A read that failed: the reason, and a button that tries again (disabled while it does). */
export function LoadFailed({ message, retrying, onRetry, className }: { message: string; retrying: boolean; onRetry(): void; className?: string }) {
  return (
    <div className={cn("space-y-3", className)}>
      <FormAlert message={message} />
      <button type="button" disabled={retrying} onClick={onRetry} className={secondaryButtonClass}>
        {retrying ? "Trying again…" : "Try again"}
      </button>
    </div>
  );
}
