// Rendered quote PDFs, kept in this process's memory (least recently used first out).
//
// Why: a quote PDF is rendered by pdfkit on the one event loop — about 150 ms of CPU for an
// 11-page quote of a 200-load system (npm run bench:load) — and while it renders, no other
// request is served. The same revision is downloaded again and again (the estimator, the office,
// the client), and its snapshot is frozen, so the bytes can be kept.
//
// What the bytes depend on, and so the key: the quote's id and revision (the label), the row's
// updated_at (an unsent draft is refreshed in place with the same revision, and every write to the
// row moves updated_at), the client link (its id and whether it still works: a reissued or stopped
// link changes the accept box) and the accept URL the caller renders with. The caller looks the
// quote up in the company's scope first; the cache is never asked about a quote the request may
// not read.
//
// One app server is the deployment this product targets (as with the rate limits); with several,
// each keeps its own copies, which stay right because the key names everything the bytes depend on.
import type { Quote } from "../db/entities/index.js";

export interface PdfCacheOptions {
  /** Total bytes kept; the least recently used PDFs are dropped beyond it. */
  maxBytes: number;
  /** A PDF larger than this is rendered every time and never kept. */
  maxEntryBytes: number;
}

/** 32 MiB: some 400 quotes of 80 KiB. */
export const QUOTE_PDF_CACHE: PdfCacheOptions = { maxBytes: 32 * 1024 * 1024, maxEntryBytes: 4 * 1024 * 1024 };

export class PdfCache {
  private readonly entries = new Map<string, Buffer>();
  private readonly rendering = new Map<string, Promise<Buffer>>();
  private bytes = 0;
  hits = 0;
  misses = 0;

  constructor(private readonly options: PdfCacheOptions = QUOTE_PDF_CACHE) {}

  /** The PDF kept under `key`, or the one `render` makes (once, however many ask at the same time). */
  async get(key: string, render: () => Promise<Buffer>): Promise<Buffer> {
    const kept = this.entries.get(key);
    if (kept) {
      // Map order is insertion order: re-inserting makes it the most recently used.
      this.entries.delete(key);
      this.entries.set(key, kept);
      this.hits += 1;
      return kept;
    }
    const pending = this.rendering.get(key);
    if (pending) {
      this.hits += 1;
      return pending;
    }
    this.misses += 1;
    const made = render().then(
      (pdf) => {
        this.rendering.delete(key);
        this.keep(key, pdf);
        return pdf;
      },
      (error: unknown) => {
        this.rendering.delete(key);
        throw error;
      },
    );
    this.rendering.set(key, made);
    return made;
  }

  get size(): { entries: number; bytes: number } {
    return { entries: this.entries.size, bytes: this.bytes };
  }

  clear(): void {
    this.entries.clear();
    this.bytes = 0;
  }

  private keep(key: string, pdf: Buffer): void {
    if (pdf.length > this.options.maxEntryBytes || pdf.length > this.options.maxBytes) return;
    const old = this.entries.get(key);
    if (old) {
      this.bytes -= old.length;
      this.entries.delete(key);
    }
    this.entries.set(key, pdf);
    this.bytes += pdf.length;
    for (const [oldest, buffer] of this.entries) {
      if (this.bytes <= this.options.maxBytes) break;
      this.entries.delete(oldest);
      this.bytes -= buffer.length;
    }
  }
}

/** Everything a quote's PDF depends on besides its frozen snapshot (see the top of this file). */
export function quotePdfKey(quote: Pick<Quote, "id" | "revision" | "updatedAt" | "linkId" | "linkHash">, acceptUrl: string | null): string {
  return [quote.id, quote.revision, quote.updatedAt.getTime(), quote.linkId ?? "-", quote.linkHash === null ? "stopped" : "live", acceptUrl ?? ""].join("|");
}
