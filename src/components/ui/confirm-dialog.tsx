import type { ReactNode } from "react";
import { Dialog } from "./dialog";
import { dangerButtonClass, secondaryButtonClass } from "./form";

interface ConfirmDialogProps {
  title: string;
  children?: ReactNode;
  confirmLabel: string;
  cancelLabel?: string;
  /** The confirmed action is on its way: both buttons wait. */
  pending?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}

/**
 * A modal question before a step that cannot be undone, on Dialog: focus starts on the safe
 * choice (Cancel), Escape cancels unless the action is on its way. Render it only while it is open.
 */
export function ConfirmDialog({ title, children, confirmLabel, cancelLabel = "Cancel", pending = false, onConfirm, onCancel }: ConfirmDialogProps) {
  return (
    <Dialog
      title={title}
      description={children}
      onClose={onCancel}
      busy={pending}
      footer={
        <>
          <button type="button" disabled={pending} onClick={onCancel} className={secondaryButtonClass}>
            {cancelLabel}
          </button>
          <button type="button" disabled={pending} onClick={onConfirm} className={dangerButtonClass}>
            {pending ? `${confirmLabel}…` : confirmLabel}
          </button>
        </>
      }
    />
  );
}
