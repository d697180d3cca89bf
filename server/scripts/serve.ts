// npm run serve: one app instance for a deployment, configured by the environment only. Unlike npm
// start it brings up no PostgreSQL, mail catcher or Stripe fake and builds nothing: DATABASE_URL is
// required, mail goes to SMTP_HOST, deposits to Stripe when STRIPE_SECRET_KEY is set (off
// otherwise), and the built client is served from dist/client when it exists (npm run build).
// Several instances may run on one database (see README, "Running several instances").
// SIGTERM or SIGINT: stop taking connections, finish the requests and jobs in flight, exit 0.
import { existsSync } from "node:fs";
import path from "node:path";
import { dataDirectory, readEnv } from "../config/env.js";
import { paymentsFromEnv, PaymentsConfigError } from "../config/payments.js";
import { startServer, type RunningServer } from "../index.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError, StartupError } from "./startup-error.js";

let running: RunningServer | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  if (!env.DATABASE_URL) throw new StartupError("DATABASE_URL is not set; npm run serve uses a database you run (npm start brings up its own).");
  let payments: ReturnType<typeof paymentsFromEnv>;
  try {
    payments = paymentsFromEnv(env);
  } catch (error) {
    if (error instanceof PaymentsConfigError) throw new StartupError(error.message);
    throw error;
  }
  const clientDir = process.env.RUNWRIGHT_CLIENT_DIR ?? path.join(projectRoot, "dist", "client");
  running = await startServer({
    env,
    databaseUrl: env.DATABASE_URL,
    clientDir: existsSync(path.join(clientDir, "index.html")) ? clientDir : undefined,
    seed: false,
    dataDir: dataDirectory(env, projectRoot),
    payments: payments === "fake" ? null : payments,
  });
  console.log(`Runwright instance ${process.pid} is serving ${running.url}/`);
}

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`${signal}: finishing requests in flight, then stopping.`);
  await running?.stop().catch((error) => console.error(`Stopping: ${error instanceof Error ? error.message : String(error)}`));
  console.log("Stopped.");
  process.exit(0);
}

process.once("SIGINT", () => void shutdown("SIGINT"));
process.once("SIGTERM", () => void shutdown("SIGTERM"));

main().catch(exitWithStartupError);
