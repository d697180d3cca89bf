import path from "node:path";
import { dataDirectory, readEnv } from "../config/env.js";
import { resolveSessionSecret } from "../config/session-secret.js";
import { startMailCatcher, type MailCatcher } from "../mail/catcher.js";
import { startServer, type RunningServer } from "../index.js";
import { buildClient } from "./build-client.js";
import { openDevDatabase } from "./dev-database.js";
import { isPortFree } from "./port-check.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError, StartupError } from "./startup-error.js";
import type { LocalPostgres } from "./postgres.js";

let cluster: LocalPostgres | undefined;
let catcher: MailCatcher | undefined;
let running: RunningServer | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  // Check the app's port first, so a second `npm start` fails at once.
  if (!(await isPortFree(env.HOST, env.PORT))) {
    throw new StartupError(`Port ${env.PORT} on ${env.HOST} is already in use (is Runwright already running?); set PORT to another port.`);
  }
  // Production without SESSION_SECRET stops here, before anything starts.
  resolveSessionSecret(env, dataDirectory(env, projectRoot));
  const database = await openDevDatabase(env);
  cluster = database.cluster;
  if (!env.SMTP_HOST) {
    catcher = await startMailCatcher(env.RUNWRIGHT_MAIL_SMTP_PORT, env.RUNWRIGHT_MAIL_WEB_PORT, path.join(dataDirectory(env, projectRoot), "mail"));
    console.log(`Mail goes to the local catcher: SMTP on 127.0.0.1:${catcher.smtpPort}, inbox at ${catcher.webUrl}/`);
  }
  const clientDir = path.join(projectRoot, "dist", "client");
  console.log("Building the client…");
  await buildClient(clientDir);
  running = await startServer({ env, databaseUrl: database.url, clientDir, dataDir: dataDirectory(env, projectRoot), mailCatcherPort: catcher?.smtpPort });
  console.log(`Runwright is running at ${running.url}/ — press Ctrl-C to stop.`);
}

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`\n${signal}: stopping Runwright…`);
  await running?.stop().catch(() => {});
  await catcher?.stop().catch(() => {});
  cluster?.stop();
  process.exit(0);
}

process.once("SIGINT", () => void shutdown("SIGINT"));
process.once("SIGTERM", () => void shutdown("SIGTERM"));

main().catch(async (error) => {
  await catcher?.stop().catch(() => {});
  cluster?.stop();
  exitWithStartupError(error);
});
