// Public surface of the System editor's entry tables. The screen imports only from here.
export { EntryTables } from "./entry-tables";
export type { EntryTablesProps, TableTab } from "./types";
export { convertUnits } from "./convert-units";
export { UnitsSwitch } from "./units-switch";
