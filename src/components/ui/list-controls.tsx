// Pieces every list screen shares (jobs, clients, limit profiles): sortable column
// headers, the pager and the debounced search box.
import { useEffect, useRef, useState, type ReactNode } from "react";
import { controlClass, secondaryButtonClass } from "./form";
import { cn } from "../../utils/cn";

/** "name" → ascending by name, "-name" → descending. */
export function sortDirection(sort: string, field: string): "ascending" | "descending" | "none" {
  if (sort === field) return "ascending";
  if (sort === `-${field}`) return "descending";
  return "none";
}

/** The sort after clicking a header: the other direction when it is already the sort, else its first direction. */
export function nextSort(sort: string, field: string, firstDirection: "asc" | "desc" = "asc"): string {
  if (sort === field) return `-${field}`;
  if (sort === `-${field}`) return field;
  return firstDirection === "desc" ? `-${field}` : field;
}

export const headerCellClass = "whitespace-nowrap px-3 py-2 align-bottom";

interface SortHeaderProps {
  label: string;
  field: string;
  sort: string;
  /** Dates read best newest first. */
  firstDirection?: "asc" | "desc";
  onSort: (sort: string) => void;
  className?: string;
}

/** A column header that sorts the list: a button inside, aria-sort on the cell. */
export function SortHeader({ label, field, sort, firstDirection = "asc", onSort, className }: SortHeaderProps) {
  const direction = sortDirection(sort, field);
  return (
    <th scope="col" aria-sort={direction} className={cn(headerCellClass, className)}>
      <button
        type="button"
        onClick={() => onSort(nextSort(sort, field, firstDirection))}
        className={cn(
          "inline-flex items-center gap-1 rounded uppercase tracking-wide hover:text-ink-900",
          direction === "none" ? "text-ink-500" : "text-ink-900",
        )}
      >
        {label}
        <svg viewBox="0 0 12 12" width="10" height="10" aria-hidden="true" className={direction === "none" ? "text-ink-300" : "text-copper-600"}>
          {direction === "descending" ? (
            <path d="M2 4l4 4 4-4" fill="none" stroke="currentColor" strokeWidth={1.6} />
          ) : direction === "ascending" ? (
            <path d="M2 8l4-4 4 4" fill="none" stroke="currentColor" strokeWidth={1.6} />
          ) : (
            <path d="M3 5l3-3 3 3M3 7l3 3 3-3" fill="none" stroke="currentColor" strokeWidth={1.4} />
          )}
        </svg>
      </button>
    </th>
  );
}

/** A plain column header with the same look. */
export function PlainHeader({ children, className }: { children: ReactNode; className?: string }) {
  return (
    <th scope="col" className={cn(headerCellClass, "uppercase tracking-wide", className)}>
      {children}
    </th>
  );
}

interface PagerProps {
  page: number;
  pageSize: number;
  total: number;
  /** What is counted: ["job", "jobs"]. */
  noun: [string, string];
  onPage: (page: number) => void;
  /** The next page is loading (the current one stays on screen). */
  busy?: boolean;
}

export function pageCount(total: number, pageSize: number): number {
  return Math.max(1, Math.ceil(total / pageSize));
}

/** Previous / Next, "Page 2 of 3" and the total count. */
export function Pager({ page, pageSize, total, noun, onPage, busy = false }: PagerProps) {
  const pages = pageCount(total, pageSize);
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 text-sm text-ink-600">
      <p className="tabular-nums">
        {total} {total === 1 ? noun[0] : noun[1]}
      </p>
      <div className="flex items-center gap-2">
        <button type="button" disabled={page <= 1 || busy} onClick={() => onPage(page - 1)} className={secondaryButtonClass}>
          Previous
        </button>
        <span aria-live="polite" className="tabular-nums">
          Page {page} of {pages}
        </span>
        <button type="button" disabled={page >= pages || busy} onClick={() => onPage(page + 1)} className={secondaryButtonClass}>
          Next
        </button>
      </div>
    </nav>
  );
}

interface SearchInputProps {
  /** The search in effect (from the address). */
  value: string;
  /** Called with the trimmed text once typing pauses (or on Enter). */
  onSearch: (text: string) => void;
  label: string;
  placeholder?: string;
  maxLength?: number;
  delayMs?: number;
  className?: string;
}

/** A search box that waits for a pause in typing before it searches. */
export function SearchInput({ value, onSearch, label, placeholder, maxLength, delayMs = 250, className }: SearchInputProps) {
  const [text, setText] = useState(value);
  // The last search this box asked for; a different value means the address changed (Back, a link).
  const asked = useRef(value);
  const onSearchRef = useRef(onSearch);
  useEffect(() => {
    onSearchRef.current = onSearch;
  });

  useEffect(() => {
    if (value !== asked.current) {
      asked.current = value;
      setText(value);
    }
  }, [value]);

  useEffect(() => {
    const trimmed = text.trim();
    if (trimmed === asked.current) return;
    const timer = setTimeout(() => {
      asked.current = trimmed;
      onSearchRef.current(trimmed);
    }, delayMs);
    return () => clearTimeout(timer);
  }, [text, delayMs]);

  return (
    <form
      role="search"
      className={className}
      onSubmit={(event) => {
        event.preventDefault();
        const trimmed = text.trim();
        if (trimmed !== asked.current) {
          asked.current = trimmed;
          onSearchRef.current(trimmed);
        }
      }}
    >
      <input
        type="search"
        aria-label={label}
        placeholder={placeholder}
        value={text}
        maxLength={maxLength}
        onChange={(event) => setText(event.target.value)}
        className={cn(controlClass, "min-w-0")}
      />
    </form>
  );
}

/** The list's look while a newer page or filter is on its way (the old rows stay). */
export const staleClass = "opacity-60 transition-opacity";
