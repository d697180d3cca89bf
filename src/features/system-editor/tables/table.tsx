// One entry table: header, rows, the Add button and the empty state. Rows are memoised and get
// only stable props, so a commit re-renders the row it changed and nothing else.
import { zodResolver } from "@hookform/resolvers/zod";
import { memo, useCallback, useEffect, useImperativeHandle, useLayoutEffect, useMemo, useRef, useState, type ReactNode, type Ref, type RefObject, type SVGProps } from "react";
import { get, useForm, type FieldValues, type Resolver } from "react-hook-form";
import { caseSchema, loadSchema, pointSchema, runSchema, sourceSchema } from "../../../../shared/engine/schema";
import { secondaryButtonClass } from "../../../components/ui/form";
import { cn } from "../../../utils/cn";
import { CellError, renderCell, type CellHandlers } from "./cells";
import type { Column, TableContext } from "./columns";
import { cellError, type RowErrors, type TableErrors } from "./error-paths";
import { rowId, sameRow, type AnyRow, type TableInfo } from "./model";
import { focusCell, type CellPosition, type Direction } from "./navigation";
import type { TableTab } from "./types";

/** What the tables ask of the editor; one stable object for every row. */
export interface TableActions {
  /** The row as committed last (the props may be a render behind). */
  rowAt(tab: TableTab, index: number): AnyRow | undefined;
  isTaken(tab: TableTab, id: string, except: number): boolean;
  commitRow(tab: TableTab, index: number, row: AnyRow): void;
  select(tab: TableTab, index: number): void;
  duplicate(tab: TableTab, at: CellPosition): void;
  remove(tab: TableTab, at: CellPosition): void;
  undo(): void;
  move(el: HTMLElement, at: CellPosition, dir: Direction): void;
}

// zodResolver over each row's shared schema. The tables hold input documents (defaults not yet
// applied), which is what these schemas read.
const asResolver = (r: unknown) => r as Resolver<FieldValues>;
const RESOLVERS: Record<TableTab, Resolver<FieldValues>> = {
  points: asResolver(zodResolver(pointSchema)),
  runs: asResolver(zodResolver(runSchema)),
  sources: asResolver(zodResolver(sourceSchema)),
  loads: asResolver(zodResolver(loadSchema)),
  cases: asResolver(zodResolver(caseSchema)),
};

const errorFields = (col: Column<AnyRow>): readonly string[] => (col.fields.length > 0 ? col.fields : [col.key]);

interface RowProps {
  tab: TableTab;
  info: TableInfo;
  row: AnyRow;
  index: number;
  rowKey: string;
  columns: readonly Column<AnyRow>[];
  /** Every field some column shows (the rest of a row's server errors go on its first cell). */
  shownFields: ReadonlySet<string>;
  ctx: TableContext;
  selected: boolean;
  externalErrors?: RowErrors;
  actions: TableActions;
  baseId: string;
  /** In a windowed table: keep this row rendered (it has focus or an error) or let it go. */
  onPin?(key: string, on: boolean): void;
}

const rowClass = (selected: boolean) =>
  // The selected row: a copper tint and a copper bar at its start (#b86632 is copper-500).
  cn("group/row", selected ? "bg-copper-50 [&>td:first-child]:shadow-[inset_3px_0_0_#b86632]" : "focus-within:bg-ink-50 hover:bg-ink-50/60");

const EditableRow = memo(function EditableRow(p: RowProps) {
  // One small form per row: the row's schema through zodResolver, and the messages it finds.
  const form = useForm<FieldValues>({ resolver: RESOLVERS[p.tab], mode: "onSubmit", reValidateMode: "onSubmit" });
  const formErrors = form.formState.errors;
  const latest = useRef(p);
  latest.current = p;
  // A server message is hidden on a cell once that cell is committed again, until the next errors arrive.
  const [hidden, setHidden] = useState<{ source: RowErrors | undefined; cols: ReadonlySet<number> }>({ source: undefined, cols: new Set() });

  const handlers = useMemo<CellHandlers>(
    () => ({
      async commit(colIndex, value) {
        const { tab, index, columns, ctx, actions, info, externalErrors, row } = latest.current;
        const col = columns[colIndex];
        const fields = [...errorFields(col)];
        const current = actions.rowAt(tab, index) ?? row;
        const candidate = col.apply(current, value, ctx);
        if (sameRow(candidate, current)) {
          form.clearErrors(fields);
          return true;
        }
        if (col.unique) {
          const id = rowId(candidate);
          if (actions.isTaken(tab, id, index)) {
            form.setError(fields[0], { type: "unique", message: `another ${info.noun} is already called "${id}"` });
            return false;
          }
        }
        form.reset(candidate, { keepErrors: true });
        const valid = col.fields.length === 0 || (await form.trigger(fields));
        if (!valid) return false;
        form.clearErrors(fields);
        actions.commitRow(tab, index, candidate);
        setHidden((h) => ({ source: externalErrors, cols: new Set(h.source === externalErrors ? [...h.cols, colIndex] : [colIndex]) }));
        return true;
      },
      fail(colIndex, message) {
        form.setError(errorFields(latest.current.columns[colIndex])[0], { type: "local", message });
      },
      revert(colIndex) {
        form.clearErrors([...errorFields(latest.current.columns[colIndex])]);
      },
      move: (el, at, dir) => latest.current.actions.move(el, at, dir),
      duplicate: (at) => latest.current.actions.duplicate(latest.current.tab, at),
      remove: (at) => latest.current.actions.remove(latest.current.tab, at),
      undo: () => latest.current.actions.undo(),
    }),
    [form],
  );

  const [focused, setFocused] = useState(false);
  const hasErrors = Object.keys(formErrors).length > 0;
  const { onPin, rowKey } = p;
  useEffect(() => {
    onPin?.(rowKey, focused || hasErrors);
  }, [onPin, rowKey, focused, hasErrors]);
  useEffect(() => () => onPin?.(rowKey, false), [onPin, rowKey]);

  const { row, index, columns, ctx, info, actions, tab } = p;
  const id = rowId(row);
  return (
    <tr
      data-row-id={id}
      aria-rowindex={index + 2}
      aria-current={p.selected || undefined}
      onFocus={() => {
        setFocused(true);
        actions.select(tab, index);
      }}
      onBlur={(e) => {
        if (!e.currentTarget.contains(e.relatedTarget as Node | null)) setFocused(false);
      }}
      className={rowClass(p.selected)}
    >
      {columns.map((col, c) => {
        const local = errorFields(col)
          .map((f) => (get(formErrors, f) as { message?: string } | undefined)?.message)
          .find(Boolean);
        const external = hidden.source === p.externalErrors && hidden.cols.has(c) ? undefined : cellError(p.externalErrors, col.fields, c === 0, p.shownFields);
        const error = local ?? col.check?.(row, ctx) ?? external;
        return (
          <td key={col.key} className="border-b border-ink-100 p-0 align-top">
            {renderCell({
              col,
              row,
              rowIndex: index,
              colIndex: c,
              ctx,
              name: `${col.label(row)} of ${info.noun} ${id}`,
              error,
              errorId: `${p.baseId}-${p.rowKey}-${c}-error`,
              handlers,
            })}
          </td>
        );
      })}
      <td className="border-b border-ink-100 px-1 py-0.5 align-top whitespace-nowrap">
        <button
          type="button"
          aria-label={`Duplicate ${info.noun} ${id}`}
          title="Duplicate (Ctrl+D)"
          onClick={() => actions.duplicate(tab, { row: index, col: 0 })}
          className="rounded p-1 text-ink-400 hover:bg-ink-100 hover:text-ink-800 focus-visible:text-ink-800"
        >
          <CopyIcon />
        </button>
        <button
          type="button"
          aria-label={`Delete ${info.noun} ${id}`}
          title="Delete (Ctrl+Delete)"
          onClick={() => actions.remove(tab, { row: index, col: 0 })}
          className="rounded p-1 text-ink-400 hover:bg-over-50 hover:text-over-700 focus-visible:text-over-700"
        >
          <TrashIcon />
        </button>
      </td>
    </tr>
  );
});

function readOnlyText(col: Column<AnyRow>, row: AnyRow, ctx: TableContext): string {
  if (col.applies && !col.applies(row)) return col.staticText?.(row) ?? "—";
  const editor = col.editor;
  switch (editor.type) {
    case "text":
    case "combo":
    {
      const text = editor.text(row, ctx);
      if (text || editor.type !== "text") return text;
      // An empty cell whose placeholder is a figure shows that default (1 set, 0 Ω, the system's temperature).
      const placeholder = editor.placeholder?.(row, ctx) ?? "";
      return /^\d/.test(placeholder) ? placeholder : "";
    }
    case "select": {
      const value = editor.value(row);
      return editor.options(row, ctx).find((o) => o.value === value)?.label ?? value;
    }
    case "check":
      return editor.checked(row) ? "Yes" : "No";
  }
}

/** Installers read the tables: plain text, a click (or focus on the first cell) selects the row. */
const ReadOnlyRow = memo(function ReadOnlyRow(p: RowProps) {
  const { row, index, columns, ctx, actions, tab } = p;
  const id = rowId(row);
  return (
    <tr
      data-row-id={id}
      aria-rowindex={index + 2}
      aria-current={p.selected || undefined}
      onClick={() => actions.select(tab, index)}
      className={cn(rowClass(p.selected), "cursor-default")}
    >
      {columns.map((col, c) => {
        const error = col.check?.(row, ctx) ?? cellError(p.externalErrors, col.fields, c === 0, p.shownFields);
        const errorId = `${p.baseId}-${p.rowKey}-${c}-error`;
        const numeric = col.editor.type === "text" && col.editor.numeric;
        return (
          <td key={col.key} className="border-b border-ink-100 p-0 align-top">
            <span
              tabIndex={c === 0 ? 0 : undefined}
              onFocus={c === 0 ? () => actions.select(tab, index) : undefined}
              aria-describedby={error ? errorId : undefined}
              className={cn("block px-1.5 py-1 whitespace-nowrap outline-none focus-visible:ring-2 focus-visible:ring-copper-500 focus-visible:ring-inset", numeric && "text-right")}
            >
              {readOnlyText(col, row, ctx) || <span className="text-ink-300">—</span>}
            </span>
            <CellError id={errorId} message={error} />
          </td>
        );
      })}
    </tr>
  );
});

const EMPTY: Record<TableTab, string> = {
  points: "No points yet. A point is where conductors meet: a bus bar, a fuse block, a junction box, a fixture's terminals.",
  runs: "No runs yet. A run is a two-conductor cable from one point to another.",
  sources: "No sources yet. Add the battery bank, power supply or PV array that feeds the system.",
  loads: "No loads yet. Add what draws power: pumps, lights, fridges, radios.",
  cases: "No cases: the system is checked at its sources' own voltages and its conductor temperature. Add a case to check another condition, such as a low battery on a hot day.",
};

export interface GridTableProps {
  info: TableInfo;
  rows: readonly AnyRow[];
  rowKeys: readonly string[];
  columns: readonly Column<AnyRow>[];
  ctx: TableContext;
  errors?: TableErrors;
  selectedId: string | null;
  readOnly: boolean;
  actions: TableActions;
  onAdd(): void;
  addRef: RefObject<HTMLButtonElement | null>;
  baseId: string;
  /** A note above the table ("add points first"). */
  notice?: string;
  ref?: Ref<GridHandle>;
}

/** What the editor asks of the table: rows outside the rendered window are rendered first. */
export interface GridHandle {
  focusCell(row: number, col: number): void;
  /** Runs `then` with the row's element once it is rendered. */
  reveal(row: number, then: (rowEl: HTMLTableRowElement) => void): void;
}

/** Rows are 28 px controls plus a 1 px rule; a row showing an error is taller, which the
 *  spacers do not know about (the window is a little off, never wrong about what is rendered). */
const ROW_HEIGHT = 29;
/** Rows rendered beyond each edge of the visible part, so Tab and the arrows find their target. */
const OVERSCAN = 8;
/** Up to this many rows, all are rendered; above it, only the visible window (and any row being
 *  edited or holding an error, so nothing typed is lost when it scrolls away). */
const WINDOW_FROM = 60;
/** Before the scroller has been measured (and in jsdom, which has no layout). */
const FALLBACK_VIEWPORT = 600;

export function GridTable(p: GridTableProps) {
  const { info, rows, columns, ctx, readOnly, rowKeys } = p;
  const shownFields = useMemo(() => new Set(columns.flatMap((c) => c.fields)), [columns]);
  const Row = readOnly ? ReadOnlyRow : EditableRow;
  const scroller = useRef<HTMLDivElement>(null);
  const tableEl = useRef<HTMLTableElement>(null);

  const [first, setFirst] = useState(0);
  const [viewport, setViewport] = useState(FALLBACK_VIEWPORT);
  const [pinned, setPinned] = useState<ReadonlySet<string>>(() => new Set());
  const onPin = useCallback((key: string, on: boolean) => {
    setPinned((set) => {
      if (set.has(key) === on) return set;
      const next = new Set(set);
      if (on) next.add(key);
      else next.delete(key);
      return next;
    });
  }, []);

  const windowed = rows.length > WINDOW_FROM;
  const indices = useMemo(() => {
    const n = rows.length;
    if (!windowed) return rows.map((_, i) => i);
    const start = Math.max(0, Math.min(first, n - 1) - OVERSCAN);
    const end = Math.min(n, Math.max(first, 0) + Math.ceil(viewport / ROW_HEIGHT) + OVERSCAN);
    const set = new Set<number>();
    for (let i = start; i < end; i += 1) set.add(i);
    if (pinned.size > 0) rowKeys.forEach((key, i) => pinned.has(key) && set.add(i));
    return [...set].sort((a, b) => a - b);
  }, [rows, windowed, first, viewport, pinned, rowKeys]);
  const rendered = useRef(new Set<number>());
  rendered.current = new Set(indices);

  const pending = useRef<{ row: number; run: (rowEl: HTMLTableRowElement) => void } | null>(null);
  const rowElement = (row: number) => tableEl.current?.querySelector<HTMLTableRowElement>(`tbody tr[aria-rowindex="${row + 2}"]`) ?? null;
  const reveal = useCallback((row: number, then: (rowEl: HTMLTableRowElement) => void) => {
    const el = rendered.current.has(row) ? rowElement(row) : null;
    if (el) {
      then(el);
      return;
    }
    pending.current = { row, run: then };
    const top = Math.max(0, row - 3);
    if (scroller.current) scroller.current.scrollTop = top * ROW_HEIGHT;
    setFirst(top);
  }, []);
  useLayoutEffect(() => {
    const want = pending.current;
    if (!want) return;
    const el = rendered.current.has(want.row) ? rowElement(want.row) : null;
    if (!el) return;
    pending.current = null;
    want.run(el);
  });
  useImperativeHandle(
    p.ref,
    () => ({
      reveal,
      focusCell: (row, col) => {
        if (row < 0) return;
        reveal(row, () => focusCell(tableEl.current, row, col));
      },
    }),
    [reveal],
  );

  const onScroll = () => {
    const el = scroller.current;
    if (!el || !windowed) return;
    setFirst(Math.floor(el.scrollTop / ROW_HEIGHT));
    setViewport(el.clientHeight || FALLBACK_VIEWPORT);
  };

  const span = columns.length + (readOnly ? 0 : 1);
  const body: ReactNode[] = [];
  let next = 0;
  const spacer = (from: number, to: number) => (
    <tr key={`gap-${from}`} aria-hidden="true">
      <td colSpan={span} style={{ height: (to - from) * ROW_HEIGHT, padding: 0, border: 0 }} />
    </tr>
  );
  for (const i of indices) {
    if (i > next) body.push(spacer(next, i));
    const row = rows[i];
    body.push(
      <Row
        key={rowKeys[i]}
        tab={info.tab}
        info={info}
        row={row}
        index={i}
        rowKey={rowKeys[i]}
        columns={columns}
        shownFields={shownFields}
        ctx={ctx}
        selected={p.selectedId !== null && rowId(row) === p.selectedId}
        externalErrors={p.errors?.get(i)}
        actions={p.actions}
        baseId={p.baseId}
        onPin={windowed ? onPin : undefined}
      />,
    );
    next = i + 1;
  }
  if (next < rows.length) body.push(spacer(next, rows.length));

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-xs text-ink-500">
          {readOnly ? (
            `${rows.length} ${rows.length === 1 ? info.noun : info.title.toLowerCase()}`
          ) : (
            <>
              <kbd className="font-sans">↑ ↓ ← →</kbd> move · <kbd className="font-sans">Enter</kbd> commits · <kbd className="font-sans">Esc</kbd> reverts · <kbd className="font-sans">F2</kbd> edits inside the text ·{" "}
              <kbd className="font-sans">Ctrl+D</kbd> duplicates · <kbd className="font-sans">Ctrl+Delete</kbd> deletes · <kbd className="font-sans">Ctrl+Z</kbd> undoes
            </>
          )}
        </p>
        {readOnly ? null : (
          <button ref={p.addRef} type="button" onClick={p.onAdd} className={cn(secondaryButtonClass, "gap-1 py-1 text-xs")}>
            <span aria-hidden="true">+</span> Add {info.noun}
          </button>
        )}
      </div>
      {p.notice ? <p className="rounded-md border border-near-100 bg-near-50 px-3 py-1.5 text-xs text-near-700">{p.notice}</p> : null}
      <div ref={scroller} onScroll={onScroll} className="max-h-[60vh] overflow-auto rounded-md border border-ink-200 bg-white">
        <table
          ref={tableEl}
          aria-label={info.title}
          aria-rowcount={rows.length + 1}
          className="w-max min-w-full border-separate border-spacing-0 text-left text-[13px] leading-tight text-ink-900 tabular-nums"
        >
          <thead>
            <tr aria-rowindex={1}>
              {columns.map((col) => (
                <th
                  key={col.key}
                  scope="col"
                  className={cn("sticky top-0 z-10 border-b border-ink-200 bg-ink-50 px-1.5 py-1.5 align-bottom text-[11px] leading-tight font-semibold text-ink-600", col.width)}
                >
                  {col.header(ctx)}
                </th>
              ))}
              {readOnly ? null : (
                <th scope="col" className="sticky top-0 z-10 w-16 border-b border-ink-200 bg-ink-50 px-1.5 py-1.5">
                  <span className="sr-only">Row actions</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>{body}</tbody>
        </table>
        {rows.length === 0 ? (
          <div className="px-4 py-6 text-center text-sm text-ink-500">
            <p>{EMPTY[info.tab]}</p>
            {readOnly ? null : (
              <p className="mt-1">
                Press <span className="font-medium text-ink-700">Add {info.noun}</span> to start.
              </p>
            )}
          </div>
        ) : null}
      </div>
    </div>
  );
}


function CopyIcon(p: SVGProps<SVGSVGElement>) {
  return (
    <svg viewBox="0 0 24 24" width="14" height="14" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" {...p}>
      <rect x="8" y="8" width="12" height="12" rx="2" />
      <path d="M16 8V6a2 2 0 0 0-2-2H6a2 2 0 0 0-2 2v8a2 2 0 0 0 2 2h2" />
    </svg>
  );
}

function TrashIcon(p: SVGProps<SVGSVGElement>) {
  return (
    <svg viewBox="0 0 24 24" width="14" height="14" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" {...p}>
      <path d="M4 7h16M10 11v6M14 11v6M6 7l1 13h10l1-13M9 7V4h6v3" />
    </svg>
  );
}
