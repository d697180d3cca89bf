import { useEffect, useId, useRef, type KeyboardEvent, type ReactNode, type RefObject } from "react";
import { cn } from "../../utils/cn";

const FOCUSABLE = 'button:not([disabled]), [href], input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';
const FIELD = "input:not([type=hidden]):not([disabled]), select:not([disabled]), textarea:not([disabled])";

const SIZE_CLASS = { sm: "max-w-md", md: "max-w-lg", lg: "max-w-2xl" } as const;

export interface DialogProps {
  title: string;
  /** A line under the title; the dialog is described by it. */
  description?: ReactNode;
  children?: ReactNode;
  /** The buttons at the foot, the safe one first: it gets the focus when the dialog opens. */
  footer?: ReactNode;
  onClose: () => void;
  /** A request is on its way: Escape and the close button wait. */
  busy?: boolean;
  /** sm (questions), md (forms), lg (two-column forms, long proposals). */
  size?: keyof typeof SIZE_CLASS;
  /** A "Close" button (×) beside the title. */
  closeButton?: boolean;
  /** Where the focus starts; by default the first button of the foot, else the first field, else the panel. */
  initialFocus?: RefObject<HTMLElement | null>;
  bodyClassName?: string;
}

/**
 * The one modal dialog: focus moves in when it opens, stays inside (Tab and Shift+Tab cycle),
 * Escape closes unless busy, and focus goes back to the opener when it closes.
 * role="dialog" aria-modal, named by its title. Render it only while it is open.
 */
export function Dialog({ title, description, children, footer, onClose, busy = false, size = "sm", closeButton = false, initialFocus, bodyClassName }: DialogProps) {
  const titleId = useId();
  const descriptionId = useId();
  const panel = useRef<HTMLDivElement>(null);
  const foot = useRef<HTMLDivElement>(null);
  const initial = useRef(initialFocus);

  useEffect(() => {
    const before = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    const target =
      initial.current?.current ??
      foot.current?.querySelector<HTMLElement>(FOCUSABLE) ??
      panel.current?.querySelector<HTMLElement>(FIELD) ??
      panel.current;
    target?.focus();
    return () => {
      if (before?.isConnected) before.focus();
    };
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === "Escape") {
      event.stopPropagation();
      if (!busy) onClose();
      return;
    }
    if (event.key !== "Tab" || !panel.current) return;
    const focusable = [...panel.current.querySelectorAll<HTMLElement>(FOCUSABLE)];
    if (focusable.length === 0) {
      event.preventDefault();
      return;
    }
    const first = focusable[0];
    const last = focusable[focusable.length - 1];
    const active = document.activeElement;
    if (event.shiftKey && (active === first || active === panel.current)) {
      event.preventDefault();
      last.focus();
    } else if (!event.shiftKey && active === last) {
      event.preventDefault();
      first.focus();
    }
  };

  return (
    <div className="fixed inset-0 z-20 flex items-start justify-center overflow-y-auto bg-ink-950/50 p-4 sm:items-center">
      <div
        ref={panel}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        aria-describedby={description ? descriptionId : undefined}
        tabIndex={-1}
        onKeyDown={onKeyDown}
        className={cn("flex max-h-[90vh] w-full flex-col rounded-lg bg-white shadow-lg outline-none", SIZE_CLASS[size])}
      >
        <div className={cn("flex items-start justify-between gap-4 px-5 pt-5 sm:px-6 sm:pt-6", !children && !footer && "pb-5 sm:pb-6")}>
          <div>
            <h2 id={titleId} className="text-base font-semibold text-ink-900">
              {title}
            </h2>
            {description ? (
              <div id={descriptionId} className="mt-1 text-sm text-ink-600">
                {description}
              </div>
            ) : null}
          </div>
          {closeButton ? (
            <button
              type="button"
              aria-label="Close"
              disabled={busy}
              onClick={onClose}
              className="-m-1 rounded p-1 text-ink-500 hover:bg-ink-50 hover:text-ink-900 disabled:text-ink-300"
            >
              <svg viewBox="0 0 24 24" width="18" height="18" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" aria-hidden="true">
                <path d="M6 6l12 12M18 6L6 18" />
              </svg>
            </button>
          ) : null}
        </div>
        {children ? (
          <div className={cn("min-h-0 overflow-y-auto px-5 pt-4 text-sm text-ink-700 sm:px-6", footer ? "pb-1" : "pb-5 sm:pb-6", bodyClassName)}>{children}</div>
        ) : null}
        {footer ? (
          <div ref={foot} className="flex flex-wrap justify-end gap-2 px-5 pt-5 pb-5 sm:px-6 sm:pb-6">
            {footer}
          </div>
        ) : null}
      </div>
    </div>
  );
}
