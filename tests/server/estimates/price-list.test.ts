// The price list API: create/change/delete with the category rules, and CSV import (preview, then
// apply, all or nothing) and export (formula cells neutralised, round trip unchanged).
import { describe, expect, it } from "vitest";
import { addMember, signUpCompany, type SignedInOwner } from "../../support/accounts.js";
import type { ApiClient } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";

const HEADER = "sku,description,category,unit,unit_cost,sell_price,size,material,conductors,rating_a";
const csv = (...lines: string[]) => `${lines.join("\r\n")}\r\n`;
const upload = (api: ApiClient, content: string | Buffer, apply = false) =>
  api.upload(`/api/price-list/import.csv${apply ? "?apply=1" : ""}`, { content, name: "prices.csv", type: "text/csv" });

/** The list as comparable rows (ids and times left out). */
async function listOf(api: ApiClient) {
  const res = await api.get("/api/price-list");
  expect(res.status).toBe(200);
  return (res.body.items as Array<Record<string, unknown>>).map(({ id: _id, updatedAt: _u, ...rest }) => rest);
}

const CABLE = { sku: "CU-16", description: "Copper cable 16 mm²", category: "cable", unit: "m", unitCostMinor: 460, cableSize: "16 mm2", cableMaterial: "copper", conductors: 1 };

describe("price list", () => {
  const t = useTestApp();

  describe("items", () => {
    it("creates (201), lists, changes (200) and deletes (204) an item", async () => {
      const owner = await signUpCompany(t.app);
      const created = await owner.api.post("/api/price-list", { ...CABLE, cableSize: "16" });
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      // a bare number is read as mm² and stored as the label
      expect(created.body).toMatchObject({ ...CABLE, sellPriceMinor: null, ratingA: null });
      expect(created.body.id).toEqual(expect.any(String));

      const list = await owner.api.get("/api/price-list");
      expect(list.status).toBe(200);
      expect(list.body.currency).toBe("USD");
      expect(list.body.items.map((i: { sku: string }) => i.sku)).toEqual(["CU-16"]);

      const changed = await owner.api.patch(`/api/price-list/${created.body.id}`, { unitCostMinor: 495, sellPriceMinor: 650 });
      expect(changed.status, JSON.stringify(changed.body)).toBe(200);
      expect(changed.body).toMatchObject({ sku: "CU-16", unitCostMinor: 495, sellPriceMinor: 650, cableSize: "16 mm2" });
      expect((await listOf(owner.api))[0]).toMatchObject({ unitCostMinor: 495, sellPriceMinor: 650 });

      const deleted = await owner.api.delete(`/api/price-list/${created.body.id}`);
      expect(deleted.status).toBe(204);
      expect(await listOf(owner.api)).toEqual([]);
      expect((await owner.api.delete(`/api/price-list/${created.body.id}`)).status).toBe(404);
      expect((await owner.api.patch(`/api/price-list/${created.body.id}`, { unitCostMinor: 1 })).status).toBe(404);
    });

    it("applies the category rules, naming the field", async () => {
      const owner = await signUpCompany(t.app);
      const noSize = await owner.api.post("/api/price-list", { ...CABLE, cableSize: undefined });
      expect(noSize.status).toBe(400);
      expect(noSize.body.error.code).toBe("invalid_input");
      expect(Object.keys(noSize.body.error.details.fields)).toContain("cableSize");

      const cableEach = await owner.api.post("/api/price-list", { ...CABLE, unit: "each" });
      expect(cableEach.status).toBe(400);
      expect(Object.keys(cableEach.body.error.details.fields)).toContain("unit");

      const ratedLug = await owner.api.post("/api/price-list", { sku: "LUG", description: "Lug", category: "termination", unit: "each", unitCostMinor: 120, ratingA: 60 });
      expect(ratedLug.status).toBe(400);
      expect(Object.keys(ratedLug.body.error.details.fields)).toContain("ratingA");

      const fractionalCents = await owner.api.post("/api/price-list", { sku: "LUG", description: "Lug", category: "termination", unit: "each", unitCostMinor: 120.5 });
      expect(fractionalCents.status).toBe(400);
      expect(Object.keys(fractionalCents.body.error.details.fields)).toContain("unitCostMinor");

      const badSize = await owner.api.post("/api/price-list", { ...CABLE, cableSize: "17 mm2" });
      expect(badSize.status).toBe(400);
      expect(Object.keys(badSize.body.error.details.fields)).toContain("cableSize");

      // a change is checked against the whole item: a cable made a fuse keeps its size and material
      const created = await owner.api.post("/api/price-list", CABLE);
      expect(created.status).toBe(201);
      const toFuse = await owner.api.patch(`/api/price-list/${created.body.id}`, { category: "fuse", unit: "each" });
      expect(toFuse.status).toBe(400);
      expect(toFuse.body.error.details.fields).toHaveProperty("cableMaterial");
      expect(await listOf(owner.api)).toEqual([expect.objectContaining({ category: "cable", unit: "m" })]);
    });

    it("refuses a SKU already in the list in another case (409), on create and on change", async () => {
      const owner = await signUpCompany(t.app);
      expect((await owner.api.post("/api/price-list", CABLE)).status).toBe(201);
      const dup = await owner.api.post("/api/price-list", { ...CABLE, sku: "cu-16", description: "Another" });
      expect(dup.status).toBe(409);
      expect(dup.body.error.code).toBe("conflict");
      const other = await owner.api.post("/api/price-list", { ...CABLE, sku: "CU-25", cableSize: "25 mm2" });
      expect(other.status).toBe(201);
      const renamed = await owner.api.patch(`/api/price-list/${other.body.id}`, { sku: "Cu-16" });
      expect(renamed.status).toBe(409);
      expect((await listOf(owner.api)).map((i) => i.sku)).toEqual(["CU-16", "CU-25"]);
      // another company may use the same SKU
      const other2 = await signUpCompany(t.app);
      expect((await other2.api.post("/api/price-list", CABLE)).status).toBe(201);
    });

    it("lets an Installer read but not change the list (403)", async () => {
      const owner = await signUpCompany(t.app);
      const item = await owner.api.post("/api/price-list", CABLE);
      const installer = await addMember(t.db, t.app, owner.companyId, "installer");
      expect((await installer.api.get("/api/price-list")).status).toBe(200);
      expect((await installer.api.get("/api/price-list/export.csv")).status).toBe(200);
      const created = await installer.api.post("/api/price-list", { ...CABLE, sku: "CU-99" });
      expect(created.status).toBe(403);
      expect(created.body.error.code).toBe("forbidden");
      expect((await installer.api.patch(`/api/price-list/${item.body.id}`, { unitCostMinor: 1 })).status).toBe(403);
      expect((await installer.api.delete(`/api/price-list/${item.body.id}`)).status).toBe(403);
      expect((await upload(installer.api, csv(HEADER, "X-1,Lug,termination,each,1.20,,,,,"), true)).status).toBe(403);
      expect(await listOf(owner.api)).toEqual([expect.objectContaining({ sku: "CU-16", unitCostMinor: 460 })]);
      // an Estimator may
      const estimator = await addMember(t.db, t.app, owner.companyId, "estimator");
      expect((await estimator.api.post("/api/price-list", { ...CABLE, sku: "CU-99" })).status).toBe(201);
    });
  });

  describe("CSV import", () => {
    const GOOD = csv(
      HEADER,
      "CU-16,Copper cable 16 mm²,cable,m,4.60,,16 mm2,copper,1,",
      "TW-2.5,Twin cable 2.5 mm²,Cable,M,1.70,2.50,2.5,Copper,2,",
      "F-60,60 A fuse,fuse,each,18.50,,,,,60",
      "FH,Fuse holder,fuse,each,$14.75,,,,,",
      "LUG,Crimp lug,termination,each,1.20,,,,,",
    );

    it("previews without saving, then applies", async () => {
      const owner = await signUpCompany(t.app);
      const preview = await upload(owner.api, GOOD);
      expect(preview.status, JSON.stringify(preview.body)).toBe(200);
      expect(preview.body).toEqual({
        added: [
          { sku: "CU-16", description: "Copper cable 16 mm²" },
          { sku: "TW-2.5", description: "Twin cable 2.5 mm²" },
          { sku: "F-60", description: "60 A fuse" },
          { sku: "FH", description: "Fuse holder" },
          { sku: "LUG", description: "Crimp lug" },
        ],
        changed: [],
        unchanged: 0,
        applied: false,
      });
      expect(await listOf(owner.api)).toEqual([]);

      const applied = await upload(owner.api, GOOD, true);
      expect(applied.status, JSON.stringify(applied.body)).toBe(200);
      expect(applied.body.applied).toBe(true);
      expect(applied.body.added).toHaveLength(5);
      const items = await listOf(owner.api);
      const bySku = Object.fromEntries(items.map((i) => [i.sku, i]));
      expect(bySku["CU-16"]).toMatchObject({ category: "cable", unit: "m", unitCostMinor: 460, sellPriceMinor: null, cableSize: "16 mm2", cableMaterial: "copper", conductors: 1 });
      expect(bySku["TW-2.5"]).toMatchObject({ unitCostMinor: 170, sellPriceMinor: 250, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 2 });
      expect(bySku["F-60"]).toMatchObject({ category: "fuse", unitCostMinor: 1850, ratingA: 60 });
      expect(bySku.FH).toMatchObject({ unitCostMinor: 1475, ratingA: null });

      // a second file changes one price and adds one item
      const again = await upload(owner.api, csv(HEADER, "CU-16,Copper cable 16 mm²,cable,m,4.95,,16 mm2,copper,1,", "F-80,80 A fuse,fuse,each,18.50,,,,,80", "LUG,Crimp lug,termination,each,1.20,,,,,"), true);
      expect(again.status, JSON.stringify(again.body)).toBe(200);
      expect(again.body).toEqual({ added: [{ sku: "F-80", description: "80 A fuse" }], changed: [{ sku: "CU-16", description: "Copper cable 16 mm²", fields: ["unit_cost"] }], unchanged: 1, applied: true });
      expect((await listOf(owner.api)).find((i) => i.sku === "CU-16")).toMatchObject({ unitCostMinor: 495 });
      expect(await listOf(owner.api)).toHaveLength(6);
    });

    it("refuses bad rows with their line numbers and columns, and saves nothing", async () => {
      const owner = await signUpCompany(t.app);
      expect((await owner.api.post("/api/price-list", CABLE)).status).toBe(201);
      const before = await listOf(owner.api);
      const file = csv(
        HEADER, // line 1
        'NEW-1,"Cable, two lines',
        'of description",termination,each,1.00,,,,,', // the record above takes lines 2-3; a description is one line
        "NEW-2,No size,cable,m,2.00,,,copper,1,", // line 4: cable without a size
        "NEW-3,Bad money,termination,each,abc,,,,,", // line 5: unit_cost is not an amount
        "CU-16,Copper cable 16 mm² (new price),cable,m,5.00,,16 mm2,copper,1,", // line 6: good (a change)
        "NEW-4,Too precise,termination,each,1.234,,,,,", // line 7: more decimals than cents
      );
      for (const apply of [false, true]) {
        const res = await upload(owner.api, file, apply);
        expect(res.status, JSON.stringify(res.body)).toBe(400);
        expect(res.body.error.code).toBe("invalid_input");
        const rows = res.body.error.details.rows as Array<{ line: number; column: string | null; message: string }>;
        expect(rows.map((r) => [r.line, r.column])).toEqual([
          [2, "description"],
          [4, "size"],
          [5, "unit_cost"],
          [7, "unit_cost"],
        ]);
        expect(rows[2].message).toContain("abc");
        expect(res.body.error.message).toMatch(/line 2/);
      }
      expect(await listOf(owner.api)).toEqual(before);
    });

    it("refuses a SKU that appears twice in the file, naming both lines", async () => {
      const owner = await signUpCompany(t.app);
      const res = await upload(owner.api, csv(HEADER, "LUG-A,Lug,termination,each,1.20,,,,,", "LUG-B,Lug,termination,each,1.20,,,,,", "lug-a,Lug again,termination,each,1.30,,,,,"), true);
      expect(res.status).toBe(400);
      const rows = res.body.error.details.rows as Array<{ line: number; column: string | null; message: string }>;
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({ line: 4, column: "sku" });
      expect(rows[0].message).toMatch(/line 2\b/);
      expect(await listOf(owner.api)).toEqual([]);
    });

    it("names the delimiter of a semicolon-separated file", async () => {
      const owner = await signUpCompany(t.app);
      const res = await upload(owner.api, csv(HEADER.replaceAll(",", ";"), "LUG;Lug;termination;each;1,20;;;;;"), true);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe("invalid_input");
      expect(res.body.error.message).toContain('";"');
      expect(res.body.error.message).toMatch(/comma/);
      expect(await listOf(owner.api)).toEqual([]);
    });

    it("refuses a file that is not UTF-8 (latin1 é)", async () => {
      const owner = await signUpCompany(t.app);
      const latin1 = Buffer.from(csv(HEADER, "LUG,Cosse à sertir,termination,each,1.20,,,,,"), "latin1");
      expect(latin1.includes(0xe0)).toBe(true);
      const res = await upload(owner.api, latin1, true);
      expect(res.status).toBe(400);
      expect(res.body.error.message).toMatch(/UTF-8/);
      expect(await listOf(owner.api)).toEqual([]);
      // the same text in UTF-8 (with a byte order mark, as spreadsheets write it) is fine
      const utf8 = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(csv(HEADER, "LUG,Cosse à sertir,termination,each,1.20,,,,,"), "utf8")]);
      const ok = await upload(owner.api, utf8, true);
      expect(ok.status, JSON.stringify(ok.body)).toBe(200);
      expect((await listOf(owner.api))[0]).toMatchObject({ sku: "LUG", description: "Cosse à sertir" });
    });

    it("refuses an empty file, a header without rows, and unknown or missing columns", async () => {
      const owner = await signUpCompany(t.app);
      for (const content of ["", "\r\n\r\n"]) {
        const res = await upload(owner.api, content, true);
        expect(res.status, JSON.stringify(res.body)).toBe(400);
        expect(res.body.error.code).toBe("invalid_input");
        expect(res.body.error.message).toMatch(/empty/);
      }
      const headerOnly = await upload(owner.api, csv(HEADER), true);
      expect(headerOnly.status).toBe(400);
      expect(headerOnly.body.error.message).toMatch(/no items/);

      const unknown = await upload(owner.api, csv(`${HEADER},colour`, "LUG,Lug,termination,each,1.20,,,,,,red"), true);
      expect(unknown.status).toBe(400);
      expect(unknown.body.error.details.rows).toEqual([expect.objectContaining({ line: 1, column: "colour" })]);

      const missing = await upload(owner.api, csv("sku,description,category,unit", "LUG,Lug,termination,each"), true);
      expect(missing.status).toBe(400);
      expect(missing.body.error.details.rows).toEqual([expect.objectContaining({ line: 1, column: "unit_cost" })]);

      const noFile = await owner.api.upload("/api/price-list/import.csv?apply=1", null, { note: "no file" });
      expect(noFile.status).toBe(400);
      expect(await listOf(owner.api)).toEqual([]);
    });
  });

  describe("CSV export", () => {
    it("round-trips through import as all unchanged, and neutralises formula cells", async () => {
      const owner: SignedInOwner = await signUpCompany(t.app);
      const FORMULA = "=cmd|' /C calc'!A0";
      const items = [
        CABLE,
        { sku: "TW-2.5", description: "Twin, 2.5 mm² \"marine\"", category: "cable", unit: "ft", unitCostMinor: 52, sellPriceMinor: 80, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 2 },
        { sku: "F-62.5", description: "62.5 A fuse", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 62.5 },
        { sku: "EVIL", description: FORMULA, category: "other", unit: "each", unitCostMinor: 100 },
        { sku: "APOS", description: "'quoted already", category: "other", unit: "each", unitCostMinor: 100 },
        { sku: "MINUS", description: "-5 % offcut allowance", category: "other", unit: "each", unitCostMinor: 0 },
        { sku: "LUG-16", description: "Lug for 16 mm²", category: "termination", unit: "each", unitCostMinor: 120, cableSize: "16 mm2" },
      ];
      for (const item of items) {
        const res = await owner.api.post("/api/price-list", item);
        expect(res.status, JSON.stringify(res.body)).toBe(201);
      }
      const before = await listOf(owner.api);

      const exported = await owner.api.get("/api/price-list/export.csv");
      expect(exported.status).toBe(200);
      expect(exported.headers["content-type"]).toMatch(/^text\/csv/);
      expect(exported.headers["content-disposition"]).toMatch(/attachment/);
      const text = exported.text;
      const lines = text.split("\r\n");
      expect(lines[0]).toBe(HEADER);
      // the formula is written with a leading apostrophe, so a spreadsheet shows it as text
      const evil = lines.find((l) => l.startsWith("EVIL,"));
      expect(evil).toBeDefined();
      expect(evil).toContain(`'${FORMULA}`);
      expect(evil).not.toMatch(/^EVIL,"?=/);
      expect(lines.find((l) => l.startsWith("MINUS,"))).toMatch(/^MINUS,"?'-5/);
      // an apostrophe of the text itself is doubled so it comes back
      expect(lines.find((l) => l.startsWith("APOS,"))).toMatch(/^APOS,"?''quoted/);
      // money in major units
      expect(lines.find((l) => l.startsWith("CU-16,"))).toBe("CU-16,Copper cable 16 mm²,cable,m,4.60,,16 mm2,copper,1,");
      expect(lines.find((l) => l.startsWith("F-62.5,"))).toBe("F-62.5,62.5 A fuse,fuse,each,18.50,,,,,62.5");

      const preview = await upload(owner.api, text);
      expect(preview.status, JSON.stringify(preview.body)).toBe(200);
      expect(preview.body).toEqual({ added: [], changed: [], unchanged: items.length, applied: false });

      // into an empty list, the file gives back the same items, the formula text as it was typed
      const fresh = await signUpCompany(t.app);
      const applied = await upload(fresh.api, text, true);
      expect(applied.status, JSON.stringify(applied.body)).toBe(200);
      expect(applied.body.added).toHaveLength(items.length);
      expect(await listOf(fresh.api)).toEqual(before);
      expect((await listOf(fresh.api)).find((i) => i.sku === "EVIL")?.description).toBe(FORMULA);
      expect((await listOf(fresh.api)).find((i) => i.sku === "APOS")?.description).toBe("'quoted already");
    });
  });
});
