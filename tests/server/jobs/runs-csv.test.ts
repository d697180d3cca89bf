import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { exampleSystem } from "../../support/jobs.js";
import type { ApiClient } from "../../support/api.js";

async function cabinSystem(api: ApiClient) {
  const client = await api.post("/api/clients", { name: "CSV client" });
  const job = await api.post("/api/jobs", { clientId: client.body.id, title: "CSV" });
  const system = await api.post(`/api/jobs/${job.body.id}/systems`, { name: "Cabin", document: exampleSystem("cabin-24v") });
  expect(system.status).toBe(201);
  return system.body as { id: string; version: number; document: ReturnType<typeof exampleSystem> };
}

const HEADER = "id,name,from,to,length,size,material,parallel,kind,fuseA";
const csv = (...rows: string[]) => [HEADER, ...rows].join("\r\n");

describe("CSV of runs: export, and import that is all or nothing", () => {
  const t = useTestApp();

  it("exports every run with a header row, UTF-8 with a byte-order mark", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const r = await owner.api.get(`/api/systems/${system.id}/runs.csv`);
    expect(r.status).toBe(200);
    expect(r.headers["content-type"]).toBe("text/csv; charset=utf-8");
    expect(r.headers["content-disposition"]).toMatch(/attachment; filename="Cabin runs.csv"/);
    expect(r.text.startsWith("\uFEFF")).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(r.text.slice(1), { header: true, skipEmptyLines: true });
    expect(parsed.data.map((row) => [row.id, row.from, row.to, row.length, row.size])).toEqual(
      system.document.runs.map((run) => [run.id, run.from, run.to, String(run.length), run.size]),
    );
    expect(parsed.meta.fields?.slice(0, 6)).toEqual(["id", "name", "from", "to", "length", "size"]);
  });

  it("export then import gives back the same runs, and bumps the version", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const exported = (await owner.api.get(`/api/systems/${system.id}/runs.csv`)).text;
    const imported = await owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content: exported, name: "runs.csv", type: "text/csv" }, { version: "1" });
    expect(imported.status, JSON.stringify(imported.body)).toBe(200);
    expect(imported.body.version).toBe(2);
    expect(imported.body.document.runs).toEqual(system.document.runs);
  });

  it("reads sizes as people type them and replaces the runs", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const file = csv("f1,Feeder,bus,shed,8,16mm²,copper,1,feeder,60", "p1,,shed,pump,22,25,Aluminium,2,,", "c1,,bus,cabin,6,16 mm2,,,feeder,80", "s1,,cabin,studio,18,4,,,,");
    const r = await owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content: file, name: "runs.csv" }, { version: "1" });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.document.runs.map((x: { id: string; size: string }) => [x.id, x.size])).toEqual([["f1", "16 mm2"], ["p1", "25 mm2"], ["c1", "16 mm2"], ["s1", "4 mm2"]]);
    expect(r.body.document.runs[1]).toMatchObject({ material: "aluminum", parallel: 2 });
  });

  it("a file with bad rows saves nothing and names each line and column", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const file = csv(
      "r1,,bus,shed,8,16 mm2,copper,1,feeder,60",
      "",
      "r2,,shed,pump,-3,16 mm2,copper,1,,",
      "r3,,shed,garage,10,16 mm2,copper,1,,",
      "r4,,bus,cabin,6,17 mm2,copper,1,,",
      "r1,,cabin,studio,18,4 mm2,copper,x,,",
    );
    const r = await owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content: file, name: "runs.csv" }, { version: "1" });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("invalid_input");
    expect(r.body.error.message).toMatch(/^file: line 4, column length: .*nothing was imported/);
    const rows = r.body.error.details.rows.map((e: { line: number; column: string }) => `${e.line}:${e.column}`);
    // Line 3 is blank and skipped; the header is line 1.
    expect(rows).toEqual(expect.arrayContaining(["4:length", "5:to", "6:size", "7:parallel", "7:id"]));
    expect(rows.some((x: string) => x.startsWith("2:"))).toBe(false);
    const now = await owner.api.get(`/api/systems/${system.id}`);
    expect(now.body.version).toBe(1);
    expect(now.body.document.runs).toEqual(system.document.runs);
  });

  it("refuses unknown or missing columns, a non-UTF-8 file, an empty file and a stale version", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const upload = (content: string | Buffer, version = "1") => owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content, name: "runs.csv" }, { version });
    const unknown = await upload("id,from,to,length,size,colour\r\nr1,bus,shed,8,16 mm2,red");
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.rows[0]).toMatchObject({ line: 1, column: "colour" });
    const missing = await upload("id,from,to,length\r\nr1,bus,shed,8");
    expect(missing.body.error.details.rows[0]).toMatchObject({ line: 1, column: "size" });
    // "Ω" in Windows-1252 is not representable; "µ" (0xB5) alone is not valid UTF-8.
    const latin1 = await upload(Buffer.from(`${HEADER}\r\nr1,Feed \xb5,bus,shed,8,16 mm2,copper,1,,`, "latin1"));
    expect(latin1.status).toBe(400);
    expect(latin1.body.error.message).toMatch(/UTF-8/);
    const empty = await upload("");
    expect(empty.status).toBe(400);
    const noVersion = await owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content: csv("r1,,bus,shed,8,16 mm2,copper,1,,"), name: "runs.csv" });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.error.details.fields).toHaveProperty("version");
    const stale = await upload(csv("r1,,bus,shed,8,16 mm2,copper,1,,"), "7");
    expect(stale.status).toBe(409);
    expect(stale.body.error.details.currentVersion).toBe(1);
    expect((await owner.api.get(`/api/systems/${system.id}`)).body.version).toBe(1);
  });

  it("cells a spreadsheet would run as formulas are neutralised on export and restored on import", async () => {
    const owner = await signUpCompany(t.app);
    const system = await cabinSystem(owner.api);
    const doc = structuredClone(system.document);
    doc.runs[0].name = "=HYPERLINK(\"http://x.test\")";
    const saved = await owner.api.put(`/api/systems/${system.id}`, { version: 1, document: doc });
    expect(saved.status).toBe(200);
    const exported = (await owner.api.get(`/api/systems/${system.id}/runs.csv`)).text;
    const row = Papa.parse<Record<string, string>>(exported.slice(1), { header: true }).data[0];
    expect(row.name).toBe("'=HYPERLINK(\"http://x.test\")");
    const back = await owner.api.upload(`/api/systems/${system.id}/runs.csv`, { content: exported, name: "runs.csv" }, { version: "2" });
    expect(back.body.document.runs[0].name).toBe("=HYPERLINK(\"http://x.test\")");
  });
});
