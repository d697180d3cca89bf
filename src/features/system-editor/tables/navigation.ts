// Moving between cells with the keyboard. Every cell's control carries data-cell="row:col", so
// moving is a lookup in the table, whatever the cell's kind.
import type { KeyboardEvent } from "react";

export type Direction = "up" | "down" | "left" | "right" | "next" | "prev";

export interface CellPosition {
  row: number;
  col: number;
}

const cellAt = (table: ParentNode, row: number, col: number) => table.querySelector<HTMLElement>(`[data-cell="${row}:${col}"]`);

/** Puts focus on a control; text is selected so typing replaces it, as in a spreadsheet. */
export function focusControl(el: HTMLElement | null): boolean {
  if (!el) return false;
  el.focus();
  if (el instanceof HTMLInputElement && el.type === "text") el.select();
  return true;
}

export function focusCell(container: ParentNode | null, row: number, col: number): boolean {
  return container ? focusControl(cellAt(container, row, col)) : false;
}

const TABBABLE = "[data-cell]:not([tabindex='-1']), button:not([disabled])";

/** Moves focus from the cell `el` (at `at`) one step in `dir`. Up/Down keep the column;
 *  Left/Right stay in the row; Tab order is the table's order of cells and row buttons. */
export function moveFrom(el: HTMLElement, at: CellPosition, dir: Direction): boolean {
  const table = el.closest("table");
  if (!table) return false;
  switch (dir) {
    case "up":
      return focusCell(table, at.row - 1, at.col);
    case "down":
      return focusCell(table, at.row + 1, at.col);
    case "left":
      return focusCell(table, at.row, at.col - 1);
    case "right":
      return focusCell(table, at.row, at.col + 1);
    case "next":
    case "prev": {
      const all = [...table.querySelectorAll<HTMLElement>(TABBABLE)];
      const i = all.indexOf(el);
      return focusControl(all[dir === "next" ? i + 1 : i - 1] ?? null);
    }
  }
}

export interface KeyContext {
  at: CellPosition;
  /** Whether the cell holds typed text not yet committed (then Ctrl+Z is the input's own undo). */
  dirty: boolean;
  /** For text inputs: whether the caret is at the start / end (Left/Right move only there). */
  edge?: { start: boolean; end: boolean };
  commit(): Promise<boolean>;
  move(el: HTMLElement, at: CellPosition, dir: Direction): void;
  duplicate(at: CellPosition): void;
  remove(at: CellPosition): void;
  undo(): void;
}

/** The keys every cell shares. Returns true when it handled the key. A move first commits the
 *  cell; an invalid value keeps focus where it is, with its message. */
export function handleCellKey(e: KeyboardEvent<HTMLElement>, k: KeyContext): boolean {
  const el = e.currentTarget;
  if ((e.ctrlKey || e.metaKey) && !e.altKey) {
    const key = e.key.toLowerCase();
    if (key === "d") {
      e.preventDefault();
      void k.commit().then((ok) => ok && k.duplicate(k.at));
      return true;
    }
    // While text is being typed, Ctrl+Backspace keeps its usual meaning (delete a word).
    if ((key === "delete" || key === "backspace") && !k.dirty) {
      e.preventDefault();
      k.remove(k.at);
      return true;
    }
    if (key === "z" && !e.shiftKey && !k.dirty) {
      e.preventDefault();
      k.undo();
      return true;
    }
    return false;
  }
  if (e.altKey) return false;
  let dir: Direction;
  switch (e.key) {
    case "ArrowUp":
      dir = "up";
      break;
    case "ArrowDown":
      dir = "down";
      break;
    case "ArrowLeft":
      if (k.edge && !k.edge.start) return false;
      dir = "left";
      break;
    case "ArrowRight":
      if (k.edge && !k.edge.end) return false;
      dir = "right";
      break;
    case "Enter":
      dir = e.shiftKey ? "up" : "down";
      break;
    case "Tab":
      dir = e.shiftKey ? "prev" : "next";
      break;
    default:
      return false;
  }
  e.preventDefault();
  void k.commit().then((ok) => {
    if (ok) k.move(el, k.at, dir);
  });
  return true;
}

/** F2 (as in a spreadsheet) puts the caret at the end of the text, so the arrows then edit it. */
export function handleEditKey(e: KeyboardEvent<HTMLInputElement>): boolean {
  if (e.key !== "F2") return false;
  e.preventDefault();
  const end = e.currentTarget.value.length;
  e.currentTarget.setSelectionRange(end, end);
  return true;
}

/** Where the caret is in a text input (a selection covering everything counts as both ends). */
export function caretEdges(input: HTMLInputElement): { start: boolean; end: boolean } {
  const start = input.selectionStart ?? 0;
  const end = input.selectionEnd ?? 0;
  const all = start === 0 && end === input.value.length;
  return { start: all || (start === 0 && end === 0), end: all || (start === input.value.length && end === input.value.length) };
}
