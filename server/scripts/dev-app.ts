import path from "node:path";
import { createServer } from "vite";
import { readEnv } from "../config/env.js";
import { startServer, type RunningServer } from "../index.js";
import { openDevDatabase } from "./dev-database.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError } from "./startup-error.js";
import type { LocalPostgres } from "./postgres.js";

// The API runs here without serving a client; Vite serves the client with HMR
// and proxies /api to the API (see vite.config.ts). Server code is not reloaded:
// restart `npm run dev` after changing it.
let cluster: LocalPostgres | undefined;
let api: RunningServer | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  const database = await openDevDatabase(env);
  cluster = database.cluster;
  api = await startServer({ env, databaseUrl: database.url });
  const vite = await createServer({ configFile: path.join(projectRoot, "vite.config.ts"), root: projectRoot });
  await vite.listen();
  console.log(`API at ${api.url}/api — client with HMR at ${vite.resolvedUrls?.local[0] ?? "(see above)"}`);
  const stop = async () => {
    await vite.close();
    await api?.stop();
    cluster?.stop();
    process.exit(0);
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

main().catch((error) => {
  cluster?.stop();
  exitWithStartupError(error);
});
