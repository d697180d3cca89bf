// The typeface of every PDF: DejaVu Sans as TTF. It covers the symbols our documents print (Ω, ²,
// ×, →, —, ±) which web-font subsets lack, and pdfkit embeds TTF (WOFF2 breaks it: STACK.md §8).
//
// Each face is read and parsed once per process. Given a Buffer, pdfkit parses the font's tables
// again for every document (about 30 ms and much garbage per render: npm run bench:pdf); given
// an already parsed font object it uses it as is, so we parse with the fontkit pdfkit itself
// depends on and hand the same object to every document. pdfkit only reads it (each document
// makes its own subset), and a render runs synchronously from the first line to doc.end().
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";

/** Names the documents select fonts by (`doc.font(FONT.bold)`). */
export const FONT = { regular: "Body", bold: "Body-Bold" } as const;

const require = createRequire(import.meta.url);
const FILES: Record<string, string> = {
  [FONT.regular]: "dejavu-fonts-ttf/ttf/DejaVuSans.ttf",
  [FONT.bold]: "dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf",
};

/** What pdfkit accepts as a font: the file's bytes, or a parsed fontkit font (it has `layout`). */
type FontSource = Buffer | { layout: (...args: unknown[]) => unknown };

/** fontkit as pdfkit resolves it, so the parsed fonts are of the version pdfkit was built for. */
function loadFontkit(): { create(bytes: Buffer): FontSource } | null {
  try {
    return createRequire(require.resolve("pdfkit"))("fontkit");
  } catch {
    return null;
  }
}

let cache: Record<string, FontSource> | null = null;

/** The two faces, read and parsed on first use (the Buffers themselves if fontkit is not found). */
export function loadFonts(): Readonly<Record<string, FontSource>> {
  if (!cache) {
    const fontkit = loadFontkit();
    cache = {};
    for (const [name, file] of Object.entries(FILES)) {
      const bytes = readFileSync(require.resolve(file));
      cache[name] = fontkit ? fontkit.create(bytes) : bytes;
    }
  }
  return cache;
}

/** Registers both faces on a document and selects the regular one. */
export function registerFonts(doc: PDFKit.PDFDocument): void {
  // The typings list only file sources; pdfkit also takes a parsed font (see above).
  for (const [name, font] of Object.entries(loadFonts())) doc.registerFont(name, font as Buffer);
  doc.font(FONT.regular);
}
