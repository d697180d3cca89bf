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
import { paymentsFromEnv, PaymentsConfigError, type PaymentsSettings } from "../config/payments.js";
import { startStripeFake, type StripeFake } from "../fakes/stripe/index.js";
import { connectToStripeFake } from "../payments/local-fake.js";

let cluster: LocalPostgres | undefined;
let catcher: MailCatcher | undefined;
let running: RunningServer | undefined;
let stripeFake: StripeFake | undefined;

async function main(): Promise<void> {
  const env = readEnv();
  // Check the app's port first, so a second `npm start` fails at once.
  if (!(await isPortFree(env.HOST, env.PORT))) {
    throw new StartupError(`Port ${env.PORT} on ${env.HOST} is already in use (is Runwright already running?); set PORT to another port.`);
  }
  // Production without SESSION_SECRET stops here, before anything starts.
  resolveSessionSecret(env, dataDirectory(env, projectRoot));
  // Production with the fake's key or a fake's address stops here too.
  let stripe: ReturnType<typeof paymentsFromEnv>;
  try {
    stripe = paymentsFromEnv(env);
  } catch (error) {
    if (error instanceof PaymentsConfigError) throw new StartupError(error.message);
    throw error;
  }
  const database = await openDevDatabase(env);
  cluster = database.cluster;
  if (!env.SMTP_HOST) {
    catcher = await startMailCatcher(env.RUNWRIGHT_MAIL_SMTP_PORT, env.RUNWRIGHT_MAIL_WEB_PORT, path.join(dataDirectory(env, projectRoot), "mail"));
    console.log(`Mail goes to the local catcher: SMTP on 127.0.0.1:${catcher.smtpPort}, inbox at ${catcher.webUrl}/`);
  }
  let payments: PaymentsSettings | null = stripe === "fake" ? null : stripe;
  if (stripe === "fake") {
    if (!(await isPortFree("127.0.0.1", env.RUNWRIGHT_STRIPE_FAKE_PORT))) {
      throw new StartupError(`Port ${env.RUNWRIGHT_STRIPE_FAKE_PORT} on 127.0.0.1 (the local Stripe fake) is already in use; set RUNWRIGHT_STRIPE_FAKE_PORT to another port, or STRIPE_SECRET_KEY to use Stripe.`);
    }
    stripeFake = await startStripeFake({ port: env.RUNWRIGHT_STRIPE_FAKE_PORT });
    const appHost = env.HOST === "0.0.0.0" || env.HOST === "::" ? "127.0.0.1" : env.HOST;
    payments = await connectToStripeFake(stripeFake.url, `http://${appHost}:${env.PORT}/api/webhooks/stripe`);
    console.log(`Deposits go to the local Stripe fake at ${stripeFake.url}/ (test card 4242 4242 4242 4242; no real money moves).`);
  } else if (!payments) {
    console.log("Online deposits are off: STRIPE_SECRET_KEY is not set.");
  }
  const clientDir = path.join(projectRoot, "dist", "client");
  console.log("Building the client…");
  await buildClient(clientDir);
  running = await startServer({ env, databaseUrl: database.url, clientDir, dataDir: dataDirectory(env, projectRoot), mailCatcherPort: catcher?.smtpPort, payments });
  console.log(`Runwright is running at ${running.url}/ — press Ctrl-C to stop.`);
}

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`\n${signal}: stopping Runwright…`);
  await running?.stop().catch(() => {});
  await catcher?.stop().catch(() => {});
  await stripeFake?.stop().catch(() => {});
  cluster?.stop();
  process.exit(0);
}

process.once("SIGINT", () => void shutdown("SIGINT"));
process.once("SIGTERM", () => void shutdown("SIGTERM"));

main().catch(async (error) => {
  await catcher?.stop().catch(() => {});
  await stripeFake?.stop().catch(() => {});
  cluster?.stop();
  exitWithStartupError(error);
});
