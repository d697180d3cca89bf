import pg from "pg";
import type { DataSource } from "typeorm";
import { createDataSource } from "../../server/db/data-source.js";

/** URL of the suite's throwaway database, set by `npm test`. */
export function testDatabaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set: run the suite with `npm test`, which starts its own PostgreSQL.");
  return url;
}

/** A DataSource on the migrated test database (global-setup ran the migrations). */
export async function openTestDb(): Promise<DataSource> {
  const db = createDataSource({ url: testDatabaseUrl(), connectTimeoutMs: 3000 });
  await db.initialize();
  return db;
}

/** Creates a fresh, empty database in the test cluster and returns its URL; drop it with the returned function. */
export async function createEmptyDatabase(name: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const admin = process.env.RUNWRIGHT_TEST_ADMIN_URL;
  if (!admin) throw new Error("RUNWRIGHT_TEST_ADMIN_URL is not set: run the suite with `npm test`.");
  const client = new pg.Client({ connectionString: admin });
  await client.connect();
  await client.query(`DROP DATABASE IF EXISTS "${name}"`);
  await client.query(`CREATE DATABASE "${name}"`);
  await client.end();
  const url = new URL(admin);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    drop: async () => {
      const c = new pg.Client({ connectionString: admin });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
      await c.end();
    },
  };
}
