import { useEffect, useId, useRef, type KeyboardEvent, type ReactNode } from "react";
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

const FOCUSABLE = 'button:not([disabled]), [href], input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

/**
 * A modal question before a step that cannot be undone. Focus starts on the safe
 * choice, stays inside while open (Tab cycles, Escape cancels) and goes back to
 * where it was when the dialog closes. Render it only while it is open.
 */
export function ConfirmDialog({ title, children, confirmLabel, cancelLabel = "Cancel", pending = false, onConfirm, onCancel }: ConfirmDialogProps) {
  const titleId = useId();
  const bodyId = useId();
  const panel = useRef<HTMLDivElement>(null);
  const cancel = useRef<HTMLButtonElement>(null);

  useEffect(() => {
    const before = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    cancel.current?.focus();
    return () => {
      if (before?.isConnected) before.focus();
    };
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === "Escape" && !pending) {
      event.stopPropagation();
      onCancel();
      return;
    }
    if (event.key !== "Tab" || !panel.current) return;
    const focusable = [...panel.current.querySelectorAll<HTMLElement>(FOCUSABLE)];
    if (focusable.length === 0) return;
    const first = focusable[0];
    const last = focusable[focusable.length - 1];
    if (event.shiftKey && document.activeElement === first) {
      event.preventDefault();
      last.focus();
    } else if (!event.shiftKey && document.activeElement === last) {
      event.preventDefault();
      first.focus();
    }
  };

  return (
    <div className="fixed inset-0 z-20 flex items-center justify-center bg-ink-950/50 p-4">
      <div
        ref={panel}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        aria-describedby={children ? bodyId : undefined}
        onKeyDown={onKeyDown}
        className="w-full max-w-md rounded-lg bg-white p-6 shadow-lg"
      >
        <h2 id={titleId} className="text-base font-semibold text-ink-900">
          {title}
        </h2>
        {children ? (
          <div id={bodyId} className="mt-2 text-sm text-ink-600">
            {children}
          </div>
        ) : null}
        <div className="mt-6 flex justify-end gap-2">
          <button ref={cancel} type="button" disabled={pending} onClick={onCancel} className={secondaryButtonClass}>
            {cancelLabel}
          </button>
          <button type="button" disabled={pending} onClick={onConfirm} className={dangerButtonClass}>
            {pending ? `${confirmLabel}…` : confirmLabel}
          </button>
        </div>
      </div>
    </div>
  );
}
