import { useEffect, useId, useRef, type KeyboardEvent, type ReactNode } from "react";

const FOCUSABLE = 'button:not([disabled]), [href], input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

interface ModalProps {
  title: string;
  children: ReactNode;
  /** The buttons at the foot, the safe one first (it gets the focus). */
  actions: ReactNode;
  onClose(): void;
  /** While busy, Escape does nothing. */
  busy?: boolean;
  wide?: boolean;
}

/**
 * A modal dialog like ConfirmDialog, for questions with their own buttons: focus goes to the first
 * button of the foot, stays inside (Tab cycles), Escape closes, and focus returns where it was.
 */
export function Modal({ title, children, actions, onClose, busy = false, wide = false }: ModalProps) {
  const titleId = useId();
  const panel = useRef<HTMLDivElement>(null);
  const foot = useRef<HTMLDivElement>(null);

  useEffect(() => {
    const before = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    foot.current?.querySelector<HTMLElement>(FOCUSABLE)?.focus();
    return () => {
      if (before?.isConnected) before.focus();
    };
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === "Escape" && !busy) {
      event.stopPropagation();
      onClose();
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
        onKeyDown={onKeyDown}
        className={`flex max-h-[90vh] w-full flex-col rounded-lg bg-white shadow-lg ${wide ? "max-w-2xl" : "max-w-md"}`}
      >
        <h2 id={titleId} className="px-6 pt-6 text-base font-semibold text-ink-900">
          {title}
        </h2>
        <div className="mt-2 overflow-y-auto px-6 text-sm text-ink-700">{children}</div>
        <div ref={foot} className="flex flex-wrap justify-end gap-2 px-6 pt-4 pb-6">
          {actions}
        </div>
      </div>
    </div>
  );
}
