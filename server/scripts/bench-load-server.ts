// The server side of `npm run bench:load`, started by bench-load.ts as its own process
// (`node --import tsx`), so the load generator never shares the server's event loop. Not a
// command of its own: it talks to its parent over the IPC channel and exits when the parent
// goes away.
//
// It makes the database "runwright_bench_load" afresh in the development cluster (as bench:solve
// does), migrates it, parses the PDF fonts (as startServer() does), serves createApp on a free
// 127.0.0.1 port and seeds, through its own API:
//   - a company (its Owner signs up) and BENCH_USERS - 1 more estimators (rows written directly,
//     as tests/support/accounts.ts addMember() does; the parent signs every one of them in);
//   - a price list covering the cable, lugs, fuses and holders both layouts below need;
//   - JOBS jobs for a handful of clients, each with the example cabin system (shared/engine/examples);
//   - "Bench job": a generated 200-load system (bench-support.ts network(10, 20)), its estimate
//     built from the layout, and a quote made and sent (the mailer here accepts and drops mail).
// Then it sends the parent { type: "ready", … } with the URL and the ids.
//
// Messages from the parent: "measure" starts the server's own counters (CPU time, event-loop delay,
// pool waiters, each kind of request's time in the server), "stats" answers them, "stop" closes the
// server and the pool and drops the database.
import { randomBytes } from "node:crypto";
import { readFileSync } from "node:fs";
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { monitorEventLoopDelay, performance } from "node:perf_hooks";
import pg from "pg";
import { pino } from "pino";
import type { SystemInput } from "../../shared/engine/schema.js";
import { CSRF_HEADER } from "../../shared/http.js";
import { createApp } from "../app.js";
import { poolOf } from "../auth/session.js";
import { hashPassword } from "../auth/passwords.js";
import { readEnv } from "../config/env.js";
import { createDataSource } from "../db/data-source.js";
import { Membership, User } from "../db/entities/index.js";
import type { Mailer } from "../mail/mailer.js";
import { loadFonts } from "../pdf/fonts.js";
import { network } from "./bench-support.js";
import { openDevDatabase } from "./dev-database.js";

const DATABASE = "runwright_bench_load";
const PASSWORD = "bench-load-password-2026";

/** What the server tells its parent once it is listening and seeded. */
export interface BenchLoadReady {
  type: "ready";
  url: string;
  /** Every person's e-mail (the Owner first); they share one password. */
  emails: string[];
  password: string;
  jobIds: string[];
  benchJobId: string;
  systemId: string;
  quoteId: string;
  /** The database is in the project's development cluster (not DATABASE_URL): it keeps running afterwards. */
  devCluster: boolean;
}

/** The server's own figures over the measured window (from "measure" to "stats"). */
export interface BenchLoadStats {
  type: "stats";
  seconds: number;
  /** User + system CPU time of the server process, ms. */
  cpuMs: number;
  /** Event-loop delay, ms (perf_hooks.monitorEventLoopDelay, 10 ms resolution). */
  loopDelay: { p50: number; p99: number; max: number };
  /** Queries waiting for one of the pool's connections (pg Pool waitingCount), sampled every 50 ms. */
  poolWaiting: { max: number; mean: number; size: number };
  /** With BENCH_TRACE_QUERIES=1: every query by kind, with the time from sending it to its answer (ms). */
  queries?: Record<string, { count: number; ms: number }>;
  /**
   * Each kind of request's time in the server, ms: from Node's "request" event (headers read, so
   * not the time a request waited in the socket while the event loop was busy) to the response's
   * "finish" (its last byte handed to the kernel), every request's.
   */
  serverTime: Record<string, number[]>;
}

/** The bench's kinds of request, by path (as bench-load.ts names them). */
function requestKind(url: string | undefined): string {
  const path = (url ?? "").split("?")[0];
  if (path === "/api/jobs") return "jobs list";
  if (/^\/api\/jobs\/[^/]+$/.test(path)) return "job detail";
  if (/^\/api\/systems\/[^/]+\/solve$/.test(path)) return "solve";
  if (/^\/api\/quotes\/[^/]+\/pdf$/.test(path)) return "quote PDF";
  return "other";
}

/** Times every pg query (pg.Client#query, which the pool and TypeORM both go through), by kind. */
function traceQueries(): { reset(): void; figures(): Record<string, { count: number; ms: number }> } {
  let figures: Record<string, { count: number; ms: number }> = {};
  const kindOf = (text: string) => {
    const sql = text.trimStart().slice(0, 200).toUpperCase();
    if (sql.includes("USER_SESSION")) return sql.startsWith("SELECT") ? "session read" : sql.startsWith("UPDATE") ? "session touch (expiry update)" : "session write";
    if (/^(START TRANSACTION|BEGIN|COMMIT|ROLLBACK)/.test(sql)) return "begin/commit";
    return sql.split(/\s/)[0].toLowerCase() || "other";
  };
  const record = (kind: string, started: number) => {
    const f = (figures[kind] ??= { count: 0, ms: 0 });
    f.count += 1;
    f.ms += performance.now() - started;
  };
  const original = pg.Client.prototype.query as (...args: unknown[]) => unknown;
  (pg.Client.prototype as unknown as { query: unknown }).query = function (this: unknown, ...args: unknown[]) {
    const config = args[0] as string | { text?: string };
    const kind = kindOf(typeof config === "string" ? config : (config?.text ?? ""));
    const started = performance.now();
    const last = args.length - 1;
    if (typeof args[last] === "function") {
      const callback = args[last] as (...a: unknown[]) => unknown;
      args[last] = (...a: unknown[]) => {
        record(kind, started);
        return callback(...a);
      };
      return original.apply(this, args);
    }
    const result = original.apply(this, args);
    if (result && typeof (result as Promise<unknown>).then === "function") {
      (result as Promise<unknown>).then(
        () => record(kind, started),
        () => record(kind, started),
      );
    }
    return result;
  };
  return { reset: () => (figures = {}), figures: () => figures };
}

/** Example cabin (shared/engine/examples) prices plus the 25 mm² feeder cable of the generated network. */
const PRICES = [
  { sku: "B-CU-25", description: "Copper cable 25 mm²", category: "cable", unit: "m", unitCostMinor: 720, cableSize: "25 mm2", cableMaterial: "copper", conductors: 1 },
  { sku: "B-CU-16", description: "Copper cable 16 mm²", category: "cable", unit: "m", unitCostMinor: 460, cableSize: "16 mm2", cableMaterial: "copper", conductors: 1 },
  { sku: "B-CU-2.5", description: "Copper cable 2.5 mm²", category: "cable", unit: "m", unitCostMinor: 85, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 1 },
  { sku: "B-LUG", description: "Crimp lug, any size", category: "termination", unit: "each", unitCostMinor: 120 },
  { sku: "B-FUSE-60", description: "60 A fuse", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 60 },
  { sku: "B-FUSE-80", description: "80 A fuse", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 80 },
  { sku: "B-FH", description: "Fuse holder", category: "fuse", unit: "each", unitCostMinor: 1475 },
];

const JOBS = 30;
const CLIENTS = 6;

const send = (message: unknown) => process.send?.(message);

async function main() {
  if (!process.send) throw new Error("bench-load-server.ts is started by `npm run bench:load` (it needs its IPC channel)");
  // The parent went away before the server was up (the next run drops the half-made database).
  const orphaned = () => process.exit(1);
  process.once("disconnect", orphaned);
  const users = Math.max(1, Math.min(500, Number(process.env.BENCH_USERS ?? 50) || 50));
  const env = readEnv();
  const { url, cluster } = await openDevDatabase(env);
  const admin = async (sql: string) => {
    const ds = createDataSource({ url });
    await ds.initialize();
    try {
      await ds.query(sql);
    } finally {
      await ds.destroy();
    }
  };
  await admin(`DROP DATABASE IF EXISTS ${DATABASE} WITH (FORCE)`);
  await admin(`CREATE DATABASE ${DATABASE}`);
  const db = createDataSource({ url: url.replace(/\/[^/]*$/, `/${DATABASE}`), connectTimeoutMs: env.DB_CONNECT_TIMEOUT_MS });
  await db.initialize();
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    server.closeAllConnections();
    await new Promise((resolve) => server.close(resolve));
    // Handlers of requests whose sockets were just closed still run: let their queries finish
    // before the pool ends (up to 20 s), or they log "Cannot use a pool after calling end".
    const pool = poolOf(db);
    for (let quiet = 0, waited = 0; quiet < 3 && waited < 20_000; waited += 100) {
      await new Promise((resolve) => setTimeout(resolve, 100));
      quiet = pool.waitingCount === 0 && pool.idleCount === pool.totalCount ? quiet + 1 : 0;
    }
    await db.destroy();
    await admin(`DROP DATABASE IF EXISTS ${DATABASE} WITH (FORCE)`);
    process.exit(0);
  };
  await db.runMigrations({ transaction: "all" });
  loadFonts();

  // As `npm start` logs (one line per request at "info"), written to /dev/null: the cost of the
  // request logger is part of a real server's cost, its lines are not wanted here.
  const logger = pino({ level: "info" }, pino.destination({ dest: "/dev/null", sync: false }));
  const dropMail: Mailer = { send: async () => {}, close: () => {} };
  const app = createApp({
    db,
    logger,
    sessionSecret: randomBytes(32).toString("base64url"),
    cookieSecure: "false",
    mailer: dropMail,
    // Every bench user signs in from 127.0.0.1 within a second: the default 10 per 15 minutes would refuse them.
    authRateLimit: { limit: 100_000, windowMs: 15 * 60 * 1000 },
  });
  // Each request's time in the server, by kind (bench-load.ts reads it per phase).
  let serverTimes: Record<string, number[]> = {};
  const server = createServer((req, res) => {
    const started = performance.now();
    const kind = requestKind(req.url); // now: the routers rewrite req.url on the way
    res.once("finish", () => (serverTimes[kind] ??= []).push(performance.now() - started));
    app(req, res);
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  process.off("disconnect", orphaned);
  process.on("disconnect", () => void stop());
  process.on("SIGTERM", () => void stop());
  process.on("SIGINT", () => void stop());

  let cookie = "";
  const call = async (method: string, path: string, body?: unknown) => {
    const response = await fetch(`${base}${path}`, {
      method,
      headers: { "Content-Type": "application/json", [CSRF_HEADER]: "1", ...(cookie ? { Cookie: cookie } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const set = response.headers.get("set-cookie");
    if (set) cookie = set.split(";")[0];
    const json = (await response.json()) as Record<string, unknown>;
    if (!response.ok) throw new Error(`${method} ${path}: ${response.status} ${JSON.stringify(json).slice(0, 300)}`);
    return json;
  };

  const ownerEmail = "owner@bench-load.test";
  const session = await call("POST", "/api/auth/sign-up", { companyName: "Bench Load Co", name: "Bench Owner", email: ownerEmail, password: PASSWORD });
  const companyId = (session.company as { id: string }).id;
  for (const item of PRICES) await call("POST", "/api/price-list", item);
  const cabin = JSON.parse(readFileSync(new URL("../../shared/engine/examples/cabin-24v.json", import.meta.url), "utf8")) as SystemInput;
  const clientIds: string[] = [];
  for (let i = 0; i < CLIENTS; i++) {
    clientIds.push((await call("POST", "/api/clients", { name: `Bench client ${i + 1}`, email: `client${i + 1}@bench-load.test` })).id as string);
  }
  const jobIds: string[] = [];
  for (let i = 0; i < JOBS; i++) {
    const job = await call("POST", "/api/jobs", { clientId: clientIds[i % CLIENTS], title: `Cabin ${i + 1}`, siteAddress: `Lot ${i + 1}, Bench Road` });
    await call("POST", `/api/jobs/${job.id}/systems`, { name: "Cabin system", document: cabin });
    jobIds.push(job.id as string);
  }
  const benchJob = await call("POST", "/api/jobs", { clientId: clientIds[0], title: "Bench job (200 loads)", siteAddress: "Unit 9, Bench Park" });
  const doc = network(10, 20);
  const system = await call("POST", `/api/jobs/${benchJob.id}/systems`, { name: "Bench 200 loads", document: doc });
  jobIds.push(benchJob.id as string);
  await call("POST", `/api/jobs/${benchJob.id}/estimate/generate`);
  const quote = await call("POST", `/api/jobs/${benchJob.id}/quotes`, {});
  await call("POST", `/api/quotes/${quote.id}/send`, { to: "client1@bench-load.test" });

  const emails = [ownerEmail];
  const passwordHash = await hashPassword(PASSWORD);
  for (let i = 1; i < users; i++) {
    const email = `estimator${i}@bench-load.test`;
    const user = await db.getRepository(User).save({ email, name: `Bench Estimator ${i}`, passwordHash });
    await db.getRepository(Membership).insert({ companyId, userId: user.id, role: "estimator" });
    emails.push(email);
  }

  // The server's own counters over the measured window.
  const tracer = process.env.BENCH_TRACE_QUERIES === "1" ? traceQueries() : undefined;
  let loop = monitorEventLoopDelay({ resolution: 10 });
  let cpu = process.cpuUsage();
  let started = process.hrtime.bigint();
  let waitingMax = 0;
  let waitingSum = 0;
  let waitingSamples = 0;
  const pool = poolOf(db);
  const sampler = setInterval(() => {
    waitingMax = Math.max(waitingMax, pool.waitingCount);
    waitingSum += pool.waitingCount;
    waitingSamples += 1;
  }, 50);
  sampler.unref();
  process.on("message", (message: { type?: string }) => {
    if (message?.type === "measure") {
      loop.disable();
      loop = monitorEventLoopDelay({ resolution: 10 });
      loop.enable();
      cpu = process.cpuUsage();
      started = process.hrtime.bigint();
      waitingMax = waitingSum = waitingSamples = 0;
      serverTimes = {};
      tracer?.reset();
    } else if (message?.type === "stats") {
      const used = process.cpuUsage(cpu);
      const stats: BenchLoadStats = {
        type: "stats",
        seconds: Number(process.hrtime.bigint() - started) / 1e9,
        cpuMs: (used.user + used.system) / 1000,
        loopDelay: { p50: loop.percentile(50) / 1e6, p99: loop.percentile(99) / 1e6, max: loop.max / 1e6 },
        poolWaiting: { max: waitingMax, mean: waitingSamples ? waitingSum / waitingSamples : 0, size: pool.totalCount },
        queries: tracer?.figures(),
        serverTime: serverTimes,
      };
      send(stats);
    } else if (message?.type === "stop") {
      void stop();
    }
  });

  const ready: BenchLoadReady = {
    type: "ready",
    url: base,
    emails,
    password: PASSWORD,
    jobIds,
    benchJobId: benchJob.id as string,
    systemId: system.id as string,
    quoteId: quote.id as string,
    devCluster: cluster !== undefined,
  };
  send(ready);
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
