import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DataSource } from "typeorm";
import { createDataSource } from "../../server/db/data-source.js";
import { verifyPassword } from "../../server/auth/passwords.js";
import { DEMO_COMPANY_ID, DEMO_COMPANY_NAME, DEMO_PASSWORD, DEMO_USERS, seedDemo } from "../../server/db/seed.js";
import { Company, Membership, User } from "../../server/db/entities/index.js";
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
