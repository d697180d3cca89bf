import path from "node:path";
import { readEnv } from "../config/env.js";
import { startServer, type RunningServer } from "../index.js";
import { buildClient } from "./build-client.js";
import { openDevDatabase } from "./dev-database.js";
import { isPortFree } from "./port-check.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError, StartupError } from "./startup-error.js";
import type { LocalPostgres } from "./postgres.js";

let cluster: LocalPostgres | undefined;
let running: RunningServer | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  // Check the app's port first, so a second `npm start` fails at once.
  if (!(await isPortFree(env.HOST, env.PORT))) {
    throw new StartupError(`Port ${env.PORT} on ${env.HOST} is already in use (is Runwright already running?); set PORT to another port.`);
  }
  const database = await openDevDatabase(env);
  cluster = database.cluster;
  const clientDir = path.join(projectRoot, "dist", "client");
  console.log("Building the client…");
  await buildClient(clientDir);
  running = await startServer({ env, databaseUrl: database.url, clientDir });
  console.log(`Runwright is running at ${running.url}/ — press Ctrl-C to stop.`);
}

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`\n${signal}: stopping Runwright…`);
  await running?.stop().catch(() => {});
  cluster?.stop();
  process.exit(0);
}

process.once("SIGINT", () => void shutdown("SIGINT"));
process.once("SIGTERM", () => void shutdown("SIGTERM"));

main().catch((error) => {
  cluster?.stop();
  exitWithStartupError(error);
});
