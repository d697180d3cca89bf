import { dangerButtonClass, secondaryButtonClass } from "./form";

/** Edit and Delete for one row of a list; `describedBy` names the row (its id element) for screen readers. */
export function RowActions({ describedBy, onEdit, onDelete }: { describedBy: string; onEdit: () => void; onDelete: () => void }) {
  return (
    <div className="flex justify-end gap-2">
      <button type="button" aria-describedby={describedBy} onClick={onEdit} className={secondaryButtonClass}>
        Edit
      </button>
      <button type="button" aria-describedby={describedBy} onClick={onDelete} className={dangerButtonClass}>
        Delete
      </button>
    </div>
  );
}
