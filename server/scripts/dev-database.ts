// The development database used by `npm start`, `npm run dev` and the db/migration
// scripts: the project's own cluster under the data folder, or DATABASE_URL.
import { createHash } from "node:crypto";
import path from "node:path";
import { dataDirectory, type Env } from "../config/env.js";
import { ensureServerBinaries, LocalPostgres, serverUserCanReach } from "./postgres.js";
import { projectRoot } from "./project-root.js";

export const DEV_DATABASE = "runwright";

/**
 * Where the development cluster lives: `<data folder>/postgres`. As root, in a
 * checkout the postgres user cannot walk into (a clone under a 700 home or
 * mktemp folder), and with RUNWRIGHT_DATA_DIR left at its default, the cluster
 * moves to a per-checkout folder under /var/tmp instead of failing.
 */
export function devClusterRoot(env: Env, source: NodeJS.ProcessEnv = process.env, checkout = projectRoot): string {
  const wanted = path.join(dataDirectory(env, checkout), "postgres");
  if (source.RUNWRIGHT_DATA_DIR || serverUserCanReach(path.dirname(wanted))) return wanted;
  const tag = createHash("sha256").update(checkout).digest("hex").slice(0, 10);
  return path.join("/var/tmp", `runwright-${tag}`, "postgres");
}

export function devCluster(env: Env): LocalPostgres {
  const root = devClusterRoot(env);
  if (!root.startsWith(projectRoot)) console.log(`The postgres user cannot reach this checkout; the database lives in ${root}.`);
  return new LocalPostgres({
    root,
    port: env.RUNWRIGHT_DB_PORT,
    portVariable: "RUNWRIGHT_DB_PORT",
    rootVariable: "RUNWRIGHT_DATA_DIR",
    log: (line) => console.log(line),
  });
}

/** Brings up the development database and returns its URL and the cluster (undefined with DATABASE_URL). */
export async function openDevDatabase(env: Env): Promise<{ url: string; cluster?: LocalPostgres }> {
  if (env.DATABASE_URL) return { url: env.DATABASE_URL };
  // Install first: the postgres user (and so where the cluster may live) exists only afterwards.
  ensureServerBinaries();
  const cluster = devCluster(env);
  await cluster.ensureRunning();
  await cluster.ensureDatabase(DEV_DATABASE);
  return { url: cluster.url(DEV_DATABASE), cluster };
}
