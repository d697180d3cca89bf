import type { ReactNode } from "react";
import type { ElementKind, Selection } from "../selection";

/** A results row's look when its element is selected, and when it is not. */
export const selectedRowClass = (selected: boolean) => (selected ? "outline outline-2 -outline-offset-2 outline-copper-500" : "hover:bg-ink-50");

export const isSelected = (selection: Selection | null, kind: ElementKind, id: string) => selection?.kind === kind && selection.id === id;

/**
 * The first cell's button of a results row: selects the element from the keyboard (the row itself
 * also selects on a click). aria-current marks the selected one.
 */
export function SelectButton({ kind, id, selected, onSelect, className = "text-left", children }: {
  kind: ElementKind;
  id: string;
  selected: boolean;
  onSelect(selection: Selection): void;
  className?: string;
  children: ReactNode;
}) {
  return (
    <button
      type="button"
      aria-current={selected ? "true" : undefined}
      onClick={(event) => {
        event.stopPropagation();
        onSelect({ kind, id });
      }}
      className={className}
    >
      {children}
    </button>
  );
}
