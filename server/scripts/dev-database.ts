// The development database used by `npm start`, `npm run dev` and the db/migration
// scripts: the project's own cluster under the data folder, or DATABASE_URL.
import path from "node:path";
import { dataDirectory, type Env } from "../config/env.js";
import { LocalPostgres } from "./postgres.js";
import { projectRoot } from "./project-root.js";

export const DEV_DATABASE = "runwright";

export function devCluster(env: Env): LocalPostgres {
  return new LocalPostgres({
    root: path.join(dataDirectory(env, projectRoot), "postgres"),
    port: env.RUNWRIGHT_DB_PORT,
    portVariable: "RUNWRIGHT_DB_PORT",
    rootVariable: "RUNWRIGHT_DATA_DIR",
    log: (line) => console.log(line),
  });
}

/** Brings up the development database and returns its URL and the cluster (undefined with DATABASE_URL). */
export async function openDevDatabase(env: Env): Promise<{ url: string; cluster?: LocalPostgres }> {
  if (env.DATABASE_URL) return { url: env.DATABASE_URL };
  const cluster = devCluster(env);
  await cluster.ensureRunning();
  await cluster.ensureDatabase(DEV_DATABASE);
  return { url: cluster.url(DEV_DATABASE), cluster };
}
