// The System editor's entry tables: Points, Runs, Sources, Loads and Cases, typed with the keyboard.
import { useCallback, useEffect, useId, useLayoutEffect, useMemo, useRef, useState, type JSX, type KeyboardEvent } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import { cn } from "../../../utils/cn";
import { sameSelection, type Selection } from "../selection";
import { caseColumns, LOAD_COLUMNS, POINT_COLUMNS, RUN_COLUMNS, SOURCE_COLUMNS, sizeOptionsFor, type Column, type TableContext } from "./columns";
import { groupErrors } from "./error-paths";
import {
  capitalise,
  deleteRow,
  duplicateRow,
  insertRow,
  newRow,
  replaceRow,
  rowId,
  rowsOf,
  TABLE_BY_TAB,
  TABLES,
  type AnyRow,
} from "./model";
import { focusControl, moveFrom } from "./navigation";
import { GridTable, type GridHandle, type TableActions } from "./table";
import type { EntryTablesProps, TableTab } from "./types";

/** How long the "… deleted — Undo" notice stays. */
const UNDO_NOTICE_MS = 8000;
const UNDO_DEPTH = 100;

interface UndoEntry {
  before: SystemInput;
  after: SystemInput;
}

interface DeletedNotice {
  message: string;
  tab: TableTab;
  index: number;
  row: AnyRow;
  entry: UndoEntry;
}

type PendingFocus = { tab: TableTab; row: number; col: number } | { tab: TableTab; add: true };

const asColumns = <R,>(columns: readonly Column<R>[]) => columns as unknown as readonly Column<AnyRow>[];
const FIXED_COLUMNS: Record<Exclude<TableTab, "cases">, readonly Column<AnyRow>[]> = {
  points: asColumns(POINT_COLUMNS),
  runs: asColumns(RUN_COLUMNS),
  sources: asColumns(SOURCE_COLUMNS),
  loads: asColumns(LOAD_COLUMNS),
};

export function EntryTables(props: EntryTablesProps): JSX.Element {
  const { value, selection, errors, readOnly = false, tab, onTabChange } = props;
  const baseId = useId().replace(/[^a-zA-Z0-9_-]/g, "");
  const latest = useRef(props);
  latest.current = props;

  // The document as last committed here: two edits before the screen re-renders build on each other.
  const doc = useRef(value);
  const seen = useRef(value);
  const emitted = useRef(new WeakSet<SystemInput>());
  const undoStack = useRef<UndoEntry[]>([]);
  if (value !== seen.current) {
    seen.current = value;
    doc.current = value;
    // A document that did not come from these tables (a load, an auto-size, a units switch)
    // starts a new history: undoing past it would silently drop that change.
    if (!emitted.current.has(value)) undoStack.current = [];
  }

  const [notice, setNotice] = useState<DeletedNotice | null>(null);
  const pendingFocus = useRef<PendingFocus | null>(null);
  const panel = useRef<HTMLDivElement>(null);
  const grid = useRef<GridHandle>(null);
  const addButton = useRef<HTMLButtonElement>(null);
  const lastOwnSelection = useRef<Selection | null>(null);
  // Stable row keys: a renamed row keeps its key (and its focus); a restored row gets its old one.
  const keyMaps = useRef(new Map<TableTab, Map<string, string>>());
  const keyCounter = useRef(0);

  const emit = useCallback((next: SystemInput, undoable = true): UndoEntry => {
    const entry = { before: doc.current, after: next };
    if (undoable) {
      undoStack.current.push(entry);
      if (undoStack.current.length > UNDO_DEPTH) undoStack.current.shift();
    }
    doc.current = next;
    emitted.current.add(next);
    latest.current.onChange(next);
    return entry;
  }, []);

  const selectRow = useCallback((t: TableTab, row: AnyRow | undefined) => {
    const next: Selection | null = row ? { kind: TABLE_BY_TAB[t].kind, id: rowId(row) } : null;
    if (sameSelection(latest.current.selection, next)) return;
    lastOwnSelection.current = next;
    latest.current.onSelect(next);
  }, []);

  const undo = useCallback(() => {
    const entry = undoStack.current.pop();
    if (!entry) return;
    if (entry.after !== doc.current) {
      undoStack.current = [];
      return;
    }
    emit(entry.before, false);
    setNotice((n) => (n?.entry === entry ? null : n));
  }, [emit]);

  const actions = useMemo<TableActions>(
    () => ({
      rowAt: (t, index) => rowsOf(doc.current, t)[index],
      isTaken: (t, id, except) => rowsOf(doc.current, t).some((r, i) => i !== except && rowId(r) === id),
      commitRow(t, index, row) {
        const before = rowsOf(doc.current, t)[index];
        if (!before) return;
        const oldId = rowId(before);
        const newId = rowId(row);
        if (oldId !== newId) {
          const keys = keyMaps.current.get(t);
          const key = keys?.get(oldId);
          if (keys && key && !keys.has(newId)) {
            keys.delete(oldId);
            keys.set(newId, key);
          }
        }
        emit(replaceRow(doc.current, t, index, row));
        const sel = latest.current.selection;
        if (oldId !== newId && sel?.kind === TABLE_BY_TAB[t].kind && sel.id === oldId) selectRow(t, row);
      },
      select: (t, index) => selectRow(t, rowsOf(doc.current, t)[index]),
      duplicate(t, at) {
        if (!rowsOf(doc.current, t)[at.row]) return;
        const { doc: next, index } = duplicateRow(doc.current, t, at.row);
        pendingFocus.current = { tab: t, row: index, col: 0 };
        emit(next);
      },
      remove(t, at) {
        const rows = rowsOf(doc.current, t);
        const row = rows[at.row];
        if (!row) return;
        const entry = emit(deleteRow(doc.current, t, at.row));
        pendingFocus.current = rows.length > 1 ? { tab: t, row: Math.min(at.row, rows.length - 2), col: at.col } : { tab: t, add: true };
        if (rows.length === 1) selectRow(t, undefined);
        setNotice({ message: `${capitalise(TABLE_BY_TAB[t].noun)} ${rowId(row)} deleted`, tab: t, index: at.row, row, entry });
      },
      undo,
      move: (el, at, dir) => {
        if (moveFrom(el, at, dir)) return;
        // The row above or below may be outside the rendered window of a long table.
        if (dir === "up" || dir === "down") grid.current?.focusCell(at.row + (dir === "up" ? -1 : 1), at.col);
      },
    }),
    [emit, selectRow, undo],
  );

  const addRow = useCallback(() => {
    const rows = rowsOf(doc.current, tab);
    pendingFocus.current = { tab, row: rows.length, col: 0 };
    emit(insertRow(doc.current, tab, rows.length, newRow(doc.current, tab)));
  }, [emit, tab]);

  const undoDelete = useCallback(() => {
    const n = notice;
    if (!n) return;
    setNotice(null);
    const top = undoStack.current.at(-1);
    if (top === n.entry && top.after === doc.current) {
      undoStack.current.pop();
      emit(n.entry.before, false);
    } else {
      // Edited since: put the row back where it was, unless its id has been taken meanwhile.
      if (rowsOf(doc.current, n.tab).some((r) => rowId(r) === rowId(n.row))) return;
      emit(insertRow(doc.current, n.tab, n.index, n.row));
    }
    pendingFocus.current = { tab: n.tab, row: n.index, col: 0 };
    if (n.tab !== latest.current.tab) latest.current.onTabChange(n.tab);
  }, [emit, notice]);

  useEffect(() => {
    if (!notice) return;
    const timer = setTimeout(() => setNotice(null), UNDO_NOTICE_MS);
    return () => clearTimeout(timer);
  }, [notice]);

  // Focus asked for by an add, duplicate, delete or undo lands once the new document is rendered.
  useLayoutEffect(() => {
    const want = pendingFocus.current;
    if (!want || want.tab !== tab) return;
    pendingFocus.current = null;
    if ("add" in want) focusControl(addButton.current);
    else grid.current?.focusCell(want.row, want.col);
  }, [value, tab]);

  // A selection made elsewhere (the diagram, the results) scrolls its row into view; focus stays
  // where it is, so nothing being typed is interrupted.
  useEffect(() => {
    if (!selection || TABLE_BY_TAB[tab].kind !== selection.kind) return;
    if (sameSelection(selection, lastOwnSelection.current)) return;
    const index = rowsOf(latest.current.value, tab).findIndex((r) => rowId(r) === selection.id);
    if (index >= 0) grid.current?.reveal(index, (rowEl) => rowEl.scrollIntoView?.({ block: "nearest" }));
  }, [selection, tab]);

  const ctx = useMemo<TableContext>(
    () => ({
      units: value.units,
      nominalVoltage: value.nominalVoltage,
      systemTemperatureC: value.conductorTemperatureC ?? 75,
      pointIds: new Set(value.points.map((p) => p.id)),
      pointOptions: value.points.map((p) => ({ value: p.id, label: p.name ? `${p.id} — ${p.name}` : p.id })),
      sizeOptions: sizeOptionsFor(value.units),
    }),
    [value.units, value.nominalVoltage, value.conductorTemperatureC, value.points],
  );

  const sourceShape = value.sources.map((s) => `${s.id}\u0000${s.type}\u0000${s.voltage ?? ""}`).join("\u0001");
  const casesColumns = useMemo(
    () => asColumns(caseColumns(latest.current.value.sources)),
    // The columns change only when a source is added, removed, renamed or retyped.
    [sourceShape],
  );
  const columns = tab === "cases" ? casesColumns : FIXED_COLUMNS[tab];

  const rows = rowsOf(value, tab);
  const rowKeys = useMemo(() => {
    let keys = keyMaps.current.get(tab);
    if (!keys) keyMaps.current.set(tab, (keys = new Map()));
    const seenIds = new Map<string, number>();
    return rows.map((r) => {
      const id = rowId(r);
      const n = (seenIds.get(id) ?? 0) + 1;
      seenIds.set(id, n);
      const name = n === 1 ? id : `${id}\u0000${n}`;
      let key = keys.get(name);
      if (!key) keys.set(name, (key = `k${++keyCounter.current}`));
      return key;
    });
  }, [rows, tab]);

  const grouped = useMemo(() => groupErrors(errors), [errors]);
  const info = TABLE_BY_TAB[tab];
  const selectedId = selection?.kind === info.kind ? selection.id : null;
  const tabRefs = useRef(new Map<TableTab, HTMLButtonElement>());

  const onTabKey = (e: KeyboardEvent<HTMLButtonElement>, index: number) => {
    const last = TABLES.length - 1;
    const to = e.key === "ArrowRight" ? (index === last ? 0 : index + 1) : e.key === "ArrowLeft" ? (index === 0 ? last : index - 1) : e.key === "Home" ? 0 : e.key === "End" ? last : -1;
    if (to < 0) return;
    e.preventDefault();
    const next = TABLES[to].tab;
    onTabChange(next);
    tabRefs.current.get(next)?.focus();
  };

  const runNotice = tab === "runs" && value.points.length < 2 ? "A run goes from one point to another: add at least two points first." : undefined;
  const loadNotice = (tab === "loads" || tab === "sources") && value.points.length === 0 ? `A ${info.noun} sits at a point: add a point first.` : undefined;

  return (
    <div className="space-y-2">
      <div role="tablist" aria-label="Entry tables" className="flex flex-wrap gap-1 border-b border-ink-200">
        {TABLES.map((t, i) => {
          const active = t.tab === tab;
          const count = rowsOf(value, t.tab).length;
          return (
            <button
              key={t.tab}
              ref={(el) => {
                if (el) tabRefs.current.set(t.tab, el);
                else tabRefs.current.delete(t.tab);
              }}
              type="button"
              role="tab"
              id={`${baseId}-tab-${t.tab}`}
              aria-selected={active}
              aria-controls={`${baseId}-panel`}
              aria-describedby={`${baseId}-count-${t.tab}`}
              tabIndex={active ? 0 : -1}
              onClick={() => onTabChange(t.tab)}
              onKeyDown={(e) => onTabKey(e, i)}
              className={cn(
                "-mb-px inline-flex items-center gap-1.5 border-b-2 px-3 py-1.5 text-sm font-medium",
                active ? "border-copper-500 text-ink-900" : "border-transparent text-ink-500 hover:text-ink-800",
              )}
            >
              <span>{t.title}</span>
              <span aria-hidden="true" className={cn("rounded-full px-1.5 text-[11px] tabular-nums", active ? "bg-copper-100 text-copper-800" : "bg-ink-100 text-ink-600")}>
                {count}
              </span>
            </button>
          );
        })}
      </div>
      {/* The tabs' row counts, read as their descriptions ("4 runs"); the tab names stay "Points", "Runs"… */}
      <div hidden>
        {TABLES.map((t) => {
          const count = rowsOf(value, t.tab).length;
          return (
            <span key={t.tab} id={`${baseId}-count-${t.tab}`}>
              {count} {count === 1 ? t.noun : t.title.toLowerCase()}
            </span>
          );
        })}
      </div>
      <div
        ref={panel}
        role="tabpanel"
        id={`${baseId}-panel`}
        aria-labelledby={`${baseId}-tab-${tab}`}
        onKeyDown={(e) => {
          // Ctrl+Z on a row button or a checkbox; a text cell handles its own (it may hold typed text).
          const target = e.target as HTMLElement;
          if (readOnly || e.defaultPrevented || !(e.ctrlKey || e.metaKey) || e.key.toLowerCase() !== "z" || e.shiftKey) return;
          if (target instanceof HTMLInputElement && target.type === "text") return;
          e.preventDefault();
          undo();
        }}
      >
        <GridTable
          // One table per tab: its scroll position and rendered window start afresh.
          key={tab}
          ref={grid}
          info={info}
          rows={rows}
          rowKeys={rowKeys}
          columns={columns}
          ctx={ctx}
          errors={grouped.get(tab)}
          selectedId={selectedId}
          readOnly={readOnly}
          actions={actions}
          onAdd={addRow}
          addRef={addButton}
          baseId={`${baseId}-${tab}`}
          notice={readOnly ? undefined : (runNotice ?? loadNotice)}
        />
      </div>
      <div role="status" aria-live="polite" className="min-h-0">
        {notice && !readOnly ? (
          <div className="inline-flex items-center gap-3 rounded-md bg-ink-900 px-3 py-1.5 text-sm text-white shadow-lg">
            <span>{notice.message} —</span>
            <button type="button" onClick={undoDelete} className="rounded px-1.5 py-0.5 font-semibold text-copper-200 underline-offset-2 hover:underline">
              Undo
            </button>
          </div>
        ) : null}
      </div>
    </div>
  );
}
