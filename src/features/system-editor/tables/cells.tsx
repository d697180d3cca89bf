// One editable cell of an entry table. Typed text stays in the cell until it is committed (Enter,
// Tab, an arrow out of the cell, blur, a picker choice), so typing re-renders only the cell.
import { useId, useMemo, useRef, useState, type KeyboardEvent, type ReactNode } from "react";
import { cn } from "../../../utils/cn";
import type { Column, Editor, Option, TableContext } from "./columns";
import { caretEdges, handleCellKey, handleEditKey, type CellPosition, type Direction } from "./navigation";

/** What a row gives each of its cells; stable between renders of the row. */
export interface CellHandlers {
  /** Validates the row with the new value and commits it; false (with the message shown) when invalid. */
  commit(col: number, value: unknown): Promise<boolean>;
  /** A message found before the schema (unparseable size, unknown point). */
  fail(col: number, message: string): void;
  /** Escape: the cell's own error goes with the typed text. */
  revert(col: number): void;
  move(el: HTMLElement, at: CellPosition, dir: Direction): void;
  duplicate(at: CellPosition): void;
  remove(at: CellPosition): void;
  undo(): void;
}

export interface CellProps<R> {
  col: Column<R>;
  row: R;
  rowIndex: number;
  colIndex: number;
  ctx: TableContext;
  /** "Size of run r1". */
  name: string;
  error?: string;
  errorId: string;
  handlers: CellHandlers;
}

export const controlClass =
  "block h-7 w-full min-w-0 bg-transparent px-1.5 py-1 text-[13px] text-ink-900 outline-none placeholder:text-ink-300 focus:bg-white focus:ring-2 focus:ring-inset focus:ring-copper-500 aria-[invalid=true]:bg-over-50 aria-[invalid=true]:ring-1 aria-[invalid=true]:ring-inset aria-[invalid=true]:ring-over-500";

export function CellError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <span id={id} className="flex gap-1 px-1.5 pb-1 text-[11px] leading-tight font-medium text-over-700">
      <span aria-hidden="true">✕</span>
      <span className="first-letter:uppercase">{message}</span>
    </span>
  );
}

/** The typed text of a cell, readable synchronously (a commit and the blur after it must agree). */
function useDraft() {
  const [draft, setState] = useState<string | null>(null);
  const ref = useRef<string | null>(null);
  const set = (next: string | null) => {
    ref.current = next;
    setState(next);
  };
  return [draft, ref, set] as const;
}

type TextEditor<R> = Extract<Editor<R>, { type: "text" }>;
type ComboEditor<R> = Extract<Editor<R>, { type: "combo" }>;

function useTextCommit<R>(p: CellProps<R>, editor: TextEditor<R> | ComboEditor<R>) {
  const committed = editor.text(p.row, p.ctx);
  const [draft, draftRef, setDraft] = useDraft();
  const commitText = async (text: string | null = draftRef.current): Promise<boolean> => {
    if (text === null) return true;
    if (text === committed) {
      setDraft(null);
      p.handlers.revert(p.colIndex);
      return true;
    }
    const parsed = editor.parse(text, p.row, p.ctx);
    if (!parsed.ok) {
      p.handlers.fail(p.colIndex, parsed.message);
      return false;
    }
    const done = await p.handlers.commit(p.colIndex, parsed.value);
    if (done && draftRef.current === text) setDraft(null);
    return done;
  };
  const revert = () => {
    setDraft(null);
    p.handlers.revert(p.colIndex);
  };
  return { committed, draft, draftRef, setDraft, commitText, revert, shown: draft ?? committed };
}

function keyContext<R>(p: CellProps<R>, dirty: boolean, commit: () => Promise<boolean>, edge?: { start: boolean; end: boolean }) {
  const h = p.handlers;
  return { at: { row: p.rowIndex, col: p.colIndex }, dirty, edge, commit, move: h.move, duplicate: h.duplicate, remove: h.remove, undo: h.undo };
}

export function TextCell<R>(p: CellProps<R> & { editor: TextEditor<R> }) {
  const { editor } = p;
  const t = useTextCommit(p, editor);
  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (handleEditKey(e)) return;
    if (e.key === "Escape") {
      if (t.draftRef.current !== null) {
        e.preventDefault();
        t.revert();
      }
      return;
    }
    handleCellKey(e, keyContext(p, t.draftRef.current !== null && t.draftRef.current !== t.committed, () => t.commitText(), caretEdges(e.currentTarget)));
  };
  return (
    <>
      <input
        type="text"
        // size=1: the column's width comes from its header, not from the input's default 20 characters.
        size={1}
        data-cell={`${p.rowIndex}:${p.colIndex}`}
        aria-label={p.name}
        aria-invalid={p.error ? true : undefined}
        aria-describedby={p.error ? p.errorId : undefined}
        value={t.shown}
        placeholder={editor.placeholder?.(p.row, p.ctx)}
        inputMode={editor.numeric ? "decimal" : undefined}
        autoComplete="off"
        spellCheck={false}
        onChange={(e) => t.setDraft(e.target.value)}
        onKeyDown={onKeyDown}
        onBlur={() => void t.commitText()}
        className={cn(controlClass, editor.numeric && "text-right tabular-nums")}
      />
      <CellError id={p.errorId} message={p.error} />
    </>
  );
}

/** Options whose label or value contains the typed text; what the text normalises to comes first. */
function filterOptions(options: readonly Option[], text: string, exact: string | null): Option[] {
  const q = text.trim().toLowerCase().replace(/²/g, "2");
  const hits = q === "" ? [...options] : options.filter((o) => o.value.toLowerCase().includes(q) || o.label.toLowerCase().replace(/²/g, "2").includes(q));
  if (exact) {
    const i = hits.findIndex((o) => o.value === exact);
    if (i > 0) hits.unshift(...hits.splice(i, 1));
  }
  return hits;
}

/** How many options a list shows at once; typing narrows it. */
const LIST_LIMIT = 60;

/** A text input with a list of choices (role="combobox"): sizes, points. The list opens as you type
 *  (or with Alt+↓ or a click); ↑/↓ then walk the list, Enter or Tab takes the highlighted choice, or
 *  the typed text when none is highlighted; Escape closes the list, a second Escape reverts. */
export function ComboCell<R>(p: CellProps<R> & { editor: ComboEditor<R> }) {
  const { editor } = p;
  const t = useTextCommit(p, editor);
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const listId = useId();
  const options = editor.options(p.ctx);
  const shown = useMemo(() => {
    if (!open) return [];
    const typed = t.draft ?? "";
    const parsed = typed ? editor.parse(typed, p.row, p.ctx) : null;
    return filterOptions(options, typed, parsed?.ok ? String(parsed.value) : null).slice(0, LIST_LIMIT);
  }, [open, t.draft, options, editor, p.row, p.ctx]);

  const close = () => {
    setOpen(false);
    setActive(-1);
  };
  const choice = () => {
    if (!open) return undefined;
    if (active >= 0) return shown[active];
    // Text that is not a value itself but matches exactly one choice ("Battery" → bus) takes it.
    const typed = t.draftRef.current;
    if (typed !== null && shown.length === 1 && !editor.parse(typed, p.row, p.ctx).ok) return shown[0];
    return undefined;
  };
  const commitChoice = async () => {
    const picked = choice();
    close();
    if (picked) {
      t.setDraft(picked.value);
      return t.commitText(picked.value);
    }
    return t.commitText();
  };

  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (handleEditKey(e)) return;
    if (e.key === "Escape") {
      if (open) {
        e.preventDefault();
        close();
      } else if (t.draftRef.current !== null) {
        e.preventDefault();
        t.revert();
      }
      return;
    }
    if (e.altKey && e.key === "ArrowDown") {
      e.preventDefault();
      setOpen(true);
      return;
    }
    if (open && shown.length > 0 && (e.key === "ArrowDown" || e.key === "ArrowUp")) {
      e.preventDefault();
      setActive((i) => (e.key === "ArrowDown" ? Math.min(i + 1, shown.length - 1) : Math.max(i - 1, -1)));
      return;
    }
    handleCellKey(e, keyContext(p, t.draftRef.current !== null && t.draftRef.current !== t.committed, commitChoice, caretEdges(e.currentTarget)));
  };

  const optionId = (i: number) => `${listId}-o${i}`;
  return (
    <div className="relative">
      <input
        type="text"
        // size=1: the column's width comes from its header, not from the input's default 20 characters.
        size={1}
        role="combobox"
        data-cell={`${p.rowIndex}:${p.colIndex}`}
        aria-label={p.name}
        aria-expanded={open}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={open && active >= 0 ? optionId(active) : undefined}
        aria-invalid={p.error ? true : undefined}
        aria-describedby={p.error ? p.errorId : undefined}
        value={t.shown}
        autoComplete="off"
        spellCheck={false}
        onChange={(e) => {
          t.setDraft(e.target.value);
          setOpen(true);
          setActive(-1);
        }}
        onClick={() => setOpen((o) => !o)}
        onKeyDown={onKeyDown}
        onBlur={() => {
          close();
          void t.commitText();
        }}
        className={controlClass}
      />
      {open ? (
        <ul
          id={listId}
          role="listbox"
          // Not the input's own name: a label search for "Size of run r1" must find one element.
          aria-label={`${p.col.label(p.row)} choices`}
          className="absolute top-full left-0 z-20 mt-0.5 max-h-56 min-w-full overflow-auto rounded-md border border-ink-200 bg-white py-1 text-[13px] shadow-lg"
        >
          {shown.length === 0 ? (
            <li role="presentation" className="px-2 py-1 whitespace-nowrap text-ink-500">
              No match. Enter keeps what you typed.
            </li>
          ) : (
            shown.map((option, i) => (
              <li
                key={option.value}
                id={optionId(i)}
                role="option"
                aria-selected={i === active}
                // mousedown, not click: the input keeps focus and its blur does not commit the typed text first.
                onMouseDown={(e) => {
                  e.preventDefault();
                  close();
                  t.setDraft(option.value);
                  void t.commitText(option.value);
                }}
                className={cn("cursor-pointer px-2 py-1 whitespace-nowrap", i === active ? "bg-copper-100 text-ink-950" : "hover:bg-ink-50")}
              >
                {option.label}
              </li>
            ))
          )}
        </ul>
      ) : null}
      <CellError id={p.errorId} message={p.error} />
    </div>
  );
}

export function SelectCell<R>(p: CellProps<R> & { editor: Extract<Editor<R>, { type: "select" }> }) {
  const { editor } = p;
  const value = editor.value(p.row);
  return (
    <>
      <select
        data-cell={`${p.rowIndex}:${p.colIndex}`}
        aria-label={p.name}
        aria-invalid={p.error ? true : undefined}
        aria-describedby={p.error ? p.errorId : undefined}
        value={value}
        onChange={(e) => void p.handlers.commit(p.colIndex, e.target.value)}
        // Arrows move between cells (Alt+↓ or typing a letter picks an option, as in any select).
        onKeyDown={(e) => handleCellKey(e, keyContext(p, false, () => Promise.resolve(true)))}
        className={cn(controlClass, "cursor-pointer pr-5")}
      >
        {editor.options(p.row, p.ctx).map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <CellError id={p.errorId} message={p.error} />
    </>
  );
}

export function CheckCell<R>(p: CellProps<R> & { editor: Extract<Editor<R>, { type: "check" }> }) {
  return (
    <>
      <span className="flex h-7 items-center justify-center px-1.5">
        <input
          type="checkbox"
          data-cell={`${p.rowIndex}:${p.colIndex}`}
          aria-label={p.name}
          aria-invalid={p.error ? true : undefined}
          aria-describedby={p.error ? p.errorId : undefined}
          checked={p.editor.checked(p.row)}
          onChange={(e) => void p.handlers.commit(p.colIndex, e.target.checked)}
          onKeyDown={(e) => handleCellKey(e, keyContext(p, false, () => Promise.resolve(true)))}
          className="size-3.5 cursor-pointer accent-copper-600 focus-visible:outline-2 focus-visible:outline-copper-500"
        />
      </span>
      <CellError id={p.errorId} message={p.error} />
    </>
  );
}

/** A cell the column does not apply to: focusable with the arrows (so moving up and down a column
 *  never skips), out of the Tab order, not editable. */
export function StaticCell<R>(p: CellProps<R> & { text: string; note: string }) {
  return (
    <span
      tabIndex={-1}
      data-cell={`${p.rowIndex}:${p.colIndex}`}
      aria-label={`${p.name}: ${p.note}`}
      onKeyDown={(e) => handleCellKey(e, keyContext(p, false, () => Promise.resolve(true)))}
      className="flex h-7 items-center px-1.5 text-ink-400 outline-none focus:bg-white focus:ring-2 focus:ring-inset focus:ring-copper-500"
    >
      {p.text}
    </span>
  );
}

export function renderCell<R>(p: CellProps<R>): ReactNode {
  const { col, row } = p;
  if (col.applies && !col.applies(row)) {
    return <StaticCell {...p} text={col.staticText?.(row) ?? "—"} note={col.staticText ? col.staticText(row) : "does not apply"} />;
  }
  const editor = col.editor;
  switch (editor.type) {
    case "text":
      return <TextCell {...p} editor={editor} />;
    case "combo":
      return <ComboCell {...p} editor={editor} />;
    case "select":
      return <SelectCell {...p} editor={editor} />;
    case "check":
      return <CheckCell {...p} editor={editor} />;
  }
}
