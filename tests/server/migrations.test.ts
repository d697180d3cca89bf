import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DataSource } from "typeorm";
import { createDataSource } from "../../server/db/data-source.js";
import { verifyPassword } from "../../server/auth/passwords.js";
import { DEMO_CLIENTS, DEMO_COMPANY_ID, DEMO_COMPANY_NAME, DEMO_JOBS, DEMO_PASSWORD, DEMO_USERS, seedDemo } from "../../server/db/seed.js";
import { Client, Company, Job, LimitProfile, Membership, PriceItem, System, User } from "../../server/db/entities/index.js";
import { buildBillOfMaterials } from "../../shared/estimate/index.js";
import { solveSystem } from "../../shared/engine/system.js";
import { createEmptyDatabase } from "../support/test-db.js";

async function tableNames(db: DataSource): Promise<string[]> {
  const rows: Array<{ table_name: string }> = await db.query(
    "SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY table_name",
  );
  return rows.map((r) => r.table_name);
}

describe("migrations on an empty database", () => {
  let db: DataSource;
  let drop: () => Promise<void>;

  beforeAll(async () => {
    const empty = await createEmptyDatabase("runwright_migrations_check");
    drop = empty.drop;
    db = createDataSource({ url: empty.url });
    await db.initialize();
  });
  afterAll(async () => {
    await db.destroy();
    await drop();
  });

  it("starts with no tables", async () => {
    expect(await tableNames(db)).toEqual([]);
  });

  it("runs every migration, after which nothing is pending", async () => {
    const ran = await db.runMigrations({ transaction: "all" });
    expect(ran.length).toBe(db.migrations.length);
    expect(ran.length).toBeGreaterThan(0);
    expect(await db.showMigrations()).toBe(false);
    expect(await tableNames(db)).toEqual(expect.arrayContaining(["company", "typeorm_migrations"]));
  });

  it("leaves a schema that matches the entities exactly (no diff to generate)", async () => {
    const diff = await db.driver.createSchemaBuilder().log();
    expect(diff.upQueries.map((q) => q.query)).toEqual([]);
  });

  it("seeds the demo company once, however often it runs", async () => {
    await seedDemo(db);
    await seedDemo(db);
    const companies = await db.getRepository(Company).findBy({ id: DEMO_COMPANY_ID });
    expect(companies).toHaveLength(1);
    expect(companies[0].name).toBe(DEMO_COMPANY_NAME);
  });

  it("seeds an Owner, an Estimator and an Installer who sign in with the demo password", async () => {
    const members = await db.getRepository(Membership).find({ where: { companyId: DEMO_COMPANY_ID }, relations: { user: true } });
    expect(members.map((m) => [m.user.email, m.role]).sort()).toEqual(DEMO_USERS.map((u) => [u.email, u.role]).sort());
    expect(new Set(members.map((m) => m.role))).toEqual(new Set(["owner", "estimator", "installer"]));
    for (const member of members) expect(await verifyPassword(member.user.passwordHash, DEMO_PASSWORD)).toBe(true);
    expect(await db.getRepository(User).countBy(DEMO_USERS.map((u) => ({ email: u.email })))).toBe(3);
  });

  it("seeds two clients and three jobs, each with a system solved at seeding, under the General profile", async () => {
    expect(await db.getRepository(Client).countBy({ companyId: DEMO_COMPANY_ID })).toBe(DEMO_CLIENTS.length);
    const jobs = await db.getRepository(Job).findBy({ companyId: DEMO_COMPANY_ID });
    expect(jobs.map((j) => j.title).sort()).toEqual(DEMO_JOBS.map((j) => j.title).sort());
    expect(jobs).toHaveLength(3);
    const systems = await db.getRepository(System).find({ where: { companyId: DEMO_COMPANY_ID }, relations: { limitProfile: true } });
    expect(systems).toHaveLength(3);
    for (const system of systems) {
      expect(system.lastSolve, system.name).not.toBeNull();
      expect(system.limitProfile?.name).toBe("General — 3 % branch, 5 % total");
      // The stored summary is what the engine says about the stored document.
      const result = solveSystem({ ...system.document, limitProfile: { branchPercent: 3, totalPercent: 5, criticalPercent: 3 } });
      expect(result.ok).toBe(true);
      if (result.ok) expect(system.lastSolve!.over).toBe(result.loads.filter((l) => l.status === "over").length);
    }
    // The cabin opens passing (its feeders already up-sized); the garden chain opens failing, to be fixed.
    const cabin = systems.find((s) => s.name.startsWith("Cabin"))!;
    expect(cabin.lastSolve).toMatchObject({ over: 0 });
    const garden = systems.find((s) => s.name.startsWith("Path lights"))!;
    expect(garden.lastSolve!.over).toBeGreaterThan(0);
    expect(await db.getRepository(LimitProfile).countBy({ companyId: DEMO_COMPANY_ID })).toBe(3);
  });

  it("seeds a price list that prices every demo layout: no missing price on any demo job", async () => {
    const items = await db.getRepository(PriceItem).findBy({ companyId: DEMO_COMPANY_ID });
    expect(items.length).toBeGreaterThan(20);
    const systems = await db.getRepository(System).findBy({ companyId: DEMO_COMPANY_ID });
    for (const system of systems) {
      const bom = buildBillOfMaterials([{ id: system.id, name: system.name, document: system.document }], items, {
        wastePercent: 10,
        labourMinutesPerRun: 20,
        labourMinutesPerMetre: 1,
        labourMinutesPerTermination: 4,
        labourRateMinor: 9500,
      });
      expect(bom.findings.filter((f) => f.code === "MISSING_PRICE"), system.name).toEqual([]);
      expect(bom.lines.some((l) => l.category === "cable"), system.name).toBe(true);
    }
    const company = await db.getRepository(Company).findOneByOrFail({ id: DEMO_COMPANY_ID });
    expect(company.quoteTerms).toContain("deposit");
  });

  it("gives companies that existed before the jobs migration the default limit profiles", async () => {
    // Undo back to before the jobs migration (later migrations come off first).
    const jobsIndex = db.migrations.findIndex((m) => m.name?.startsWith("CreateJobs"));
    expect(jobsIndex).toBeGreaterThan(0);
    for (let i = db.migrations.length - 1; i >= jobsIndex; i--) await db.undoLastMigration({ transaction: "all" });
    expect(await tableNames(db)).not.toContain("limit_profile");
    await db.runMigrations({ transaction: "all" });
    const names = (await db.getRepository(LimitProfile).findBy({ companyId: DEMO_COMPANY_ID })).map((p) => p.name).sort();
    expect(names).toEqual(["Company custom", "General — 3 % branch, 5 % total", "Marine DC — 3 % critical, 10 % other"]);
    await seedDemo(db);
  });

  it("reverts every migration with its down step and runs them again", async () => {
    for (let i = 0; i < db.migrations.length; i++) await db.undoLastMigration({ transaction: "all" });
    expect(await tableNames(db)).toEqual(["typeorm_migrations"]);
    await db.runMigrations({ transaction: "all" });
    expect(await tableNames(db)).toContain("company");
  });
});

describe("the migration list", () => {
  it("names every migration file in server/db/migrations, oldest first", async () => {
    const { readdirSync } = await import("node:fs");
    const { migrations } = await import("../../server/db/migrations/index.js");
    const files = readdirSync("server/db/migrations").filter((f) => /^\d+-[a-z0-9-]+\.ts$/.test(f)).sort();
    const stamps = migrations.map((m) => Number(/(\d+)$/.exec(m.name)![1]));
    expect(stamps).toEqual(files.map((f) => Number(f.split("-")[0])));
    expect([...stamps].sort((a, b) => a - b)).toEqual(stamps);
  });
});
