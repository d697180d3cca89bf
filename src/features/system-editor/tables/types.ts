import type { SystemInput } from "../../../../shared/engine/schema";
import type { Selection } from "../selection";

export type TableTab = "points" | "runs" | "sources" | "loads" | "cases";

export interface EntryTablesProps {
  /** The network document being edited (runwright-system/1, see shared/engine/schema.ts). */
  value: SystemInput;
  /** Called with the whole new document after every committed edit: a cell committed (Enter, Tab, blur, picker
   *  choice), a row added / duplicated / deleted, an undo. Never on every keystroke. */
  onChange(next: SystemInput): void;
  selection: Selection | null;
  onSelect(selection: Selection | null): void;
  /** Errors from the server/engine keyed by document path, e.g. "runs[2].size" or "loads[0].watts"; shown on the cell. */
  errors?: Record<string, string>;
  readOnly?: boolean;
  /** Which table is shown; controlled so the screen can switch to the table of a selected element. */
  tab: TableTab;
  onTabChange(tab: TableTab): void;
}
