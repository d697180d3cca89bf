import path from "node:path";
import { createServer } from "vite";
import { dataDirectory, readEnv } from "../config/env.js";
import { startMailCatcher, type MailCatcher } from "../mail/catcher.js";
import { startServer, type RunningServer } from "../index.js";
import { openDevDatabase } from "./dev-database.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError } from "./startup-error.js";
import type { LocalPostgres } from "./postgres.js";

// The API runs here without serving a client; Vite serves the client with HMR
// and proxies /api to the API (see vite.config.ts). Server code is not reloaded:
// restart `npm run dev` after changing it.
let cluster: LocalPostgres | undefined;
let catcher: MailCatcher | undefined;
let api: RunningServer | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  const database = await openDevDatabase(env);
  cluster = database.cluster;
  if (!env.SMTP_HOST) {
    catcher = await startMailCatcher(env.RUNWRIGHT_MAIL_SMTP_PORT, env.RUNWRIGHT_MAIL_WEB_PORT, path.join(dataDirectory(env, projectRoot), "mail"));
    console.log(`Mail goes to the local catcher: SMTP on 127.0.0.1:${catcher.smtpPort}, inbox at ${catcher.webUrl}/`);
  }
  api = await startServer({ env, databaseUrl: database.url, dataDir: dataDirectory(env, projectRoot), mailCatcherPort: catcher?.smtpPort });
  const vite = await createServer({ configFile: path.join(projectRoot, "vite.config.ts"), root: projectRoot });
  await vite.listen();
  console.log(`API at ${api.url}/api — client with HMR at ${vite.resolvedUrls?.local[0] ?? "(see above)"}`);
  const stop = async () => {
    await vite.close();
    await api?.stop();
    await catcher?.stop().catch(() => {});
    cluster?.stop();
    process.exit(0);
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

main().catch(async (error) => {
  await catcher?.stop().catch(() => {});
  cluster?.stop();
  exitWithStartupError(error);
});
