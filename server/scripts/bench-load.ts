// npm run bench:load: the server under load from many signed-in people at once — a benchmark, not a
// test. It prints figures and whether each target is met, and never fails on a missed target (the
// exit code is 0 unless the script itself breaks).
//
// What it does: starts the server in a child process (bench-load-server.ts, run with node --import
// tsx: its own event loop, its own memory), which makes the database "runwright_bench_load" afresh
// in the development cluster, seeds a company with BENCH_USERS people (default 50), 31 jobs and a
// sent quote of a 200-load system, and serves createApp on 127.0.0.1. This process signs every
// person in over HTTP (one session each) and then loads the server from BENCH_CONNECTIONS
// connections (default 50; each carries its own session cookie, and the CSRF header on POST):
//   jobs list   GET  /api/jobs                        30 %
//   job detail  GET  /api/jobs/:id (31 jobs in turn)  30 %
//   solve       POST /api/systems/:id/solve           20 %  the 200-load system's saved document
//   quote PDF   GET  /api/quotes/:id/pdf              20 %  the sent quote of that system
// (BENCH_MIX=15,15,10,10 sets the weights: that many connections of each kind.) In three steps:
//   warm-up     BENCH_WARMUP s (default 5, not counted), unpaced: compiles the hot code, opens the
//               pool's connections and fills the PDF cache; then 2 s quiet.
//   paced       BENCH_DURATION s (default 60): each connection is one signed-in person sending
//               BENCH_RATE requests a second (default 1; autocannon's connectionRate: at most that
//               many in each 1-second window of the connection, the next as soon as the previous is
//               answered). One autocannon instance per connection, started evenly staggered over the
//               first second, so 50 × 1 req/s is a request every 20 ms, not 50 at once each second.
//               Offered: connections × rate req/s. The issue's targets ("50 concurrent signed-in
//               clients for 60 s") are judged on this phase.
//   saturation  BENCH_SATURATION_DURATION s (default 20; 0 skips it): no pacing — every connection
//               sends its next request as soon as the answer arrives — so the server runs flat out:
//               its req/s is the capacity, and its latency is mostly queueing (mean ≈ connections ÷
//               throughput). Printed next to the targets, as what they are not: the targets' scenario.
// Latency is timed per response by autocannon (request written → response complete) and kept
// whole here, so p50/p95/p99 are exact; beside it, each request's time in the server (the "srv"
// columns: Node's request event → response finished, from bench-load-server.ts), which leaves out
// the time a request waited in its socket while the event loop was busy. A paced connection whose answer comes later than its pace
// sends its next request late, and that wait is in no latency (coordinated omission): the paced
// phase prints offered and achieved req/s and how many answers were slower than the pace.
// Errors: non-2xx answers + socket errors (timeouts, 10 s, among them) + answers whose body is wrong
// (a PDF not starting with %PDF-, a solve not {"ok":true…).
// The server's memory: /proc/<pid>/status VmRSS sampled every 200 ms (peak and mean per phase), and
// VmHWM (the process's peak since it started, seeding included) after each phase.
// Targets (the issue): no errors; solve p95 ≤ 100 ms; quote PDF p95 ≤ 500 ms.
//
// Options: BENCH_DURATION / --duration (s, paced), BENCH_RATE / --rate (requests a second per
// connection, whole), BENCH_SATURATION_DURATION / --saturation-duration (s, 0 = none),
// BENCH_CONNECTIONS / --connections, BENCH_WARMUP / --warmup (s), BENCH_MIX / --mix, BENCH_USERS /
// --users. E.g. BENCH_DURATION=10 BENCH_SATURATION_DURATION=0 npm run bench:load.
// Diagnosis: BENCH_TRACE_QUERIES=1 counts and times the server's queries by kind (per phase);
// BENCH_CPU_PROF=<folder> has the server write a V8 CPU profile (.cpuprofile) there when it stops
// (the whole run: seeding, warm-up and both phases — BENCH_SATURATION_DURATION=0 for the paced one).
// Figures are for the machine it runs on; the load generator, PostgreSQL and the server share its
// cores, so compare them only with figures from the same machine, and mind what else is running:
// the load average is printed before, after each phase and at the end, and per phase the CPU
// contention (Linux): how long the server's main thread, all its threads and the bench database's
// PostgreSQL backends ran and waited, runnable, for a core (/proc/…/schedstat), how busy the
// machine's cores were (/proc/stat) and how much of the time some task waited for one (PSI,
// /proc/pressure/cpu).
import { type ChildProcess, spawn } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { CSRF_HEADER } from "../../shared/http.js";
import { SESSION_COOKIE } from "../auth/session.js";
// Types only: importing bench-load-server.ts for values would run the server in this process.
import type { BenchLoadReady, BenchLoadStats } from "./bench-load-server.js";
import { projectRoot } from "./project-root.js";

// autocannon ships no types: the part of its API used here.
interface AutocannonRequest {
  method?: string;
  path?: string;
  headers?: Record<string, string>;
  body?: string | Buffer;
  setupRequest?: (request: AutocannonRequest, context: object) => AutocannonRequest;
}
interface AutocannonClient {
  setRequests(requests: AutocannonRequest[]): void;
}
interface AutocannonResult {
  duration: number;
  errors: number;
  timeouts: number;
  mismatches: number;
  non2xx: number;
  totalBytes: number;
  statusCodeStats: Record<string, { count: number }>;
}
interface AutocannonInstance {
  on(event: "response", listener: (client: AutocannonClient, statusCode: number, bytes: number, ms: number) => void): void;
  on(event: "reqError", listener: (error: Error) => void): void;
  on(event: "done", listener: (result: AutocannonResult) => void): void;
  stop(): void;
}
interface AutocannonOptions {
  url: string;
  connections: number;
  duration: number;
  timeout: number;
  requests: AutocannonRequest[];
  setupClient: (client: AutocannonClient) => void;
  verifyBody?: (body: string) => boolean;
  /** Requests per second per connection (a whole number ≥ 1): at most that many in each 1-second window. */
  connectionRate?: number;
  /** autocannon's own histogram (not used here) would otherwise be back-filled for paced connections. */
  ignoreCoordinatedOmission?: boolean;
}
type Autocannon = (options: AutocannonOptions, done: (error: Error | null, result: AutocannonResult) => void) => AutocannonInstance;
const autocannon = createRequire(import.meta.url)("autocannon") as Autocannon;

const TARGET_SOLVE_P95_MS = 100;
const TARGET_PDF_P95_MS = 500;
const RSS_SAMPLE_MS = 200;
/** Quiet time after the warm-up: the handlers of its cut-off requests finish before the paced phase starts. */
const SETTLE_MS = 2000;

// ---------------------------------------------------------------- settings

function setting(name: string, fallback: number, min: number, max: number, whole = false): number {
  const flag = `--${name}`;
  const envName = `BENCH_${name.toUpperCase().replaceAll("-", "_")}`;
  const args = process.argv.slice(2);
  let raw: string | undefined = process.env[envName];
  for (let i = 0; i < args.length; i++) {
    if (args[i] === flag) raw = args[i + 1];
    else if (args[i].startsWith(`${flag}=`)) raw = args[i].slice(flag.length + 1);
  }
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value < min || value > max || (whole && !Number.isInteger(value))) {
    throw new Error(`${flag} / ${envName}: ${raw} is not a${whole ? " whole" : ""} number from ${min} to ${max}`);
  }
  return value;
}

function mixSetting(): number[] {
  const args = process.argv.slice(2);
  const i = args.findIndex((a) => a === "--mix" || a.startsWith("--mix="));
  const raw = i < 0 ? process.env.BENCH_MIX : args[i].includes("=") ? args[i].slice(6) : args[i + 1];
  if (!raw) return [15, 15, 10, 10];
  const weights = raw.split(",").map(Number);
  if (weights.length !== 4 || weights.some((w) => !Number.isFinite(w) || w < 0) || weights.every((w) => w === 0)) {
    throw new Error(`--mix / BENCH_MIX: ${raw} is not four weights (jobs list, job detail, solve, PDF), e.g. 15,15,10,10`);
  }
  return weights;
}

/** Splits `total` connections by `weights` (largest remainder; at least one for a non-zero weight when there are enough). */
function split(total: number, weights: number[]): number[] {
  const sum = weights.reduce((a, b) => a + b, 0);
  const exact = weights.map((w) => (w / sum) * total);
  const out = exact.map(Math.floor);
  const order = exact.map((e, i) => [e - Math.floor(e), i] as const).sort((a, b) => b[0] - a[0]);
  for (let k = 0; out.reduce((a, b) => a + b, 0) < total; k++) out[order[k % order.length][1]] += 1;
  const wanted = weights.filter((w) => w > 0).length;
  if (total >= wanted) {
    for (let i = 0; i < out.length; i++) {
      if (weights[i] > 0 && out[i] === 0) {
        const donor = out.indexOf(Math.max(...out));
        out[donor] -= 1;
        out[i] = 1;
      }
    }
  }
  return out;
}

// ---------------------------------------------------------------- figures

const quantile = (sorted: readonly number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))] : Number.NaN);
const fmtMs = (v: number) => (Number.isNaN(v) ? "—" : v >= 100 ? v.toFixed(0) : v.toFixed(1));
const mib = (kib: number) => `${(kib / 1024).toFixed(0)} MiB`;

/** VmRSS / VmHWM of a process in KiB (Linux /proc), or NaN when it cannot be read. */
function procStatus(pid: number, field: "VmRSS" | "VmHWM"): number {
  try {
    const m = new RegExp(`^${field}:\\s+(\\d+) kB`, "m").exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : Number.NaN;
  } catch {
    return Number.NaN;
  }
}

// ---------------------------------------------------------------- CPU contention (Linux /proc)

interface Sched {
  /** ns on a core */
  run: number;
  /** ns runnable, waiting for a core */
  wait: number;
}

/** /proc/…/schedstat: time on a core and time runnable but waiting for one, of one thread. */
function readSched(file: string): Sched | undefined {
  try {
    const [run, wait] = readFileSync(file, "utf8").trim().split(/\s+/).map(Number);
    return Number.isFinite(run) && Number.isFinite(wait) ? { run, wait } : undefined;
  } catch {
    return undefined;
  }
}

/** Run and wait time over a phase of a changing set of threads (sampled, so threads that end keep their last figures). */
class SchedTracker {
  private first = new Map<string, Sched>();
  private last = new Map<string, Sched>();
  constructor(private readonly files: () => string[]) {}
  start() {
    this.first.clear();
    this.last.clear();
    for (const file of this.files()) {
      const s = readSched(file);
      if (s) this.first.set(file, s), this.last.set(file, s);
    }
  }
  sample() {
    for (const file of this.files()) {
      const s = readSched(file);
      if (!s) continue;
      // A thread that appeared during the phase: all of its time is in the phase.
      if (!this.first.has(file)) this.first.set(file, { run: 0, wait: 0 });
      this.last.set(file, s);
    }
  }
  totals(): { runMs: number; waitMs: number; threads: number } {
    this.sample();
    let run = 0;
    let wait = 0;
    for (const [file, end] of this.last) {
      const begin = this.first.get(file)!;
      run += end.run - begin.run;
      wait += end.wait - begin.wait;
    }
    return { runMs: run / 1e6, waitMs: wait / 1e6, threads: this.last.size };
  }
}

/** The PostgreSQL backends serving `database` (their process title names it). */
function postgresBackends(database: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const title = readFileSync(`/proc/${entry}/cmdline`, "utf8");
      if (title.startsWith("postgres: ") && title.split(/[\s\0]+/)[2] === database) out.push(`/proc/${entry}/schedstat`);
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

/** The whole machine: CPU time by state (/proc/stat, jiffies) and PSI "some" stall time (µs). */
function machineCpu(): { busy: number; steal: number; total: number; psiSomeUs: number } {
  let busy = Number.NaN;
  let steal = Number.NaN;
  let total = Number.NaN;
  let psiSomeUs = Number.NaN;
  try {
    // cpu  user nice system idle iowait irq softirq steal guest guest_nice
    const f = readFileSync("/proc/stat", "utf8").split("\n")[0].trim().split(/\s+/).slice(1).map(Number);
    total = f.slice(0, 8).reduce((a, b) => a + b, 0);
    busy = total - f[3] - f[4] - f[7];
    steal = f[7];
  } catch {
    // not Linux
  }
  try {
    psiSomeUs = Number(/^some .*total=(\d+)/m.exec(readFileSync("/proc/pressure/cpu", "utf8"))?.[1] ?? Number.NaN);
  } catch {
    // no PSI
  }
  return { busy, steal, total, psiSomeUs };
}

interface Contention {
  server: { runMs: number; waitMs: number };
  serverAll: { runMs: number; waitMs: number; threads: number };
  postgres: { runMs: number; waitMs: number; threads: number };
  machine: { busyPercent: number; stealPercent: number; psiSomePercent: number };
}

/** Follows the server's threads, the bench database's backends and the machine over a phase. */
function contentionMeter(pid: number, database: string) {
  const main = new SchedTracker(() => [`/proc/${pid}/task/${pid}/schedstat`]);
  const all = new SchedTracker(() => {
    try {
      return readdirSync(`/proc/${pid}/task`).map((tid) => `/proc/${pid}/task/${tid}/schedstat`);
    } catch {
      return [];
    }
  });
  let backends: string[] = [];
  const postgres = new SchedTracker(() => backends);
  let machineStart = machineCpu();
  let started = performance.now();
  return {
    start() {
      backends = postgresBackends(database);
      for (const t of [main, all, postgres]) t.start();
      machineStart = machineCpu();
      started = performance.now();
    },
    /** Every second or so: catches threads and backends before they end. */
    sample() {
      backends = postgresBackends(database);
      for (const t of [main, all, postgres]) t.sample();
    },
    stop(): Contention {
      const m = machineCpu();
      const wallUs = (performance.now() - started) * 1000;
      const jiffies = m.total - machineStart.total;
      return {
        server: main.totals(),
        serverAll: all.totals(),
        postgres: postgres.totals(),
        machine: {
          busyPercent: ((m.busy - machineStart.busy) / jiffies) * 100,
          stealPercent: ((m.steal - machineStart.steal) / jiffies) * 100,
          psiSomePercent: ((m.psiSomeUs - machineStart.psiSomeUs) / wallUs) * 100,
        },
      };
    },
  };
}

// ---------------------------------------------------------------- the server in its child process

interface Child {
  process: ChildProcess;
  ready: BenchLoadReady;
  stats(): Promise<BenchLoadStats>;
  measure(): void;
  stop(): Promise<void>;
}

async function startChild(users: number): Promise<Child> {
  // BENCH_CPU_PROF=<folder>: the server writes a V8 CPU profile there when it stops (open it in Chrome DevTools).
  const profile = process.env.BENCH_CPU_PROF ? ["--cpu-prof", `--cpu-prof-dir=${path.resolve(process.env.BENCH_CPU_PROF)}`] : [];
  const child = spawn(process.execPath, [...profile, "--import", "tsx", path.join(projectRoot, "server/scripts/bench-load-server.ts")], {
    cwd: projectRoot,
    env: { ...process.env, BENCH_USERS: String(users) },
    stdio: ["ignore", "inherit", "inherit", "ipc"],
  });
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
  const ready = await new Promise<BenchLoadReady>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("the bench server did not get ready within 180 s")), 180_000);
    child.on("message", (message: { type?: string }) => {
      if (message?.type === "ready") {
        clearTimeout(timer);
        resolve(message as BenchLoadReady);
      }
    });
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`the bench server exited (code ${code}) before it was ready`));
    });
  });
  return {
    process: child,
    ready,
    measure: () => child.send({ type: "measure" }),
    stats: () =>
      new Promise((resolve) => {
        const listener = (message: { type?: string }) => {
          if (message?.type !== "stats") return;
          child.off("message", listener);
          resolve(message as BenchLoadStats);
        };
        child.on("message", listener);
        child.send({ type: "stats" });
      }),
    stop: async () => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.send({ type: "stop" });
      const timer = setTimeout(() => child.kill("SIGKILL"), 20_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

// ---------------------------------------------------------------- sessions and requests

async function signIn(base: string, email: string, password: string): Promise<string> {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: "POST",
    headers: { "Content-Type": "application/json", [CSRF_HEADER]: "1" },
    body: JSON.stringify({ email, password }),
  });
  const cookie = (response.headers.get("set-cookie") ?? "").split(";")[0];
  if (!response.ok || !cookie.startsWith(`${SESSION_COOKIE}=`)) throw new Error(`sign-in of ${email}: ${response.status} ${(await response.text()).slice(0, 200)}`);
  return cookie;
}

interface Kind {
  name: string;
  connections: number;
  /** The requests of one connection, with its session cookie. */
  requests(cookie: string): AutocannonRequest[];
  verifyBody?: (body: string) => boolean;
}

interface Errors {
  non2xx: number;
  socket: number;
  timeouts: number;
  body: number;
}

/** One kind's figures over a phase (a row of the table). */
interface Row {
  name: string;
  conns: number;
  /** Sorted, ms. */
  latencies: number[];
  /** The same requests' time in the server (bench-load-server.ts serverTime), sorted, ms. */
  serverTimes: number[];
  /** Responses a second: each autocannon instance's responses ÷ its own duration, summed. */
  rate: number;
  mibps: number;
  errors: Errors;
  statusCodes: Record<string, number>;
  errorSamples: string[];
}

/** What one autocannon instance measured. */
interface Part {
  result: AutocannonResult;
  latencies: number[];
  bytes: number;
  errorSamples: string[];
}

/** One autocannon instance of `connections` connections of one kind; each connection gets the next session. */
function runInstance(base: string, kind: Kind, connections: number, seconds: number, session: () => string, rate?: number): Promise<Part> {
  return new Promise<Part>((resolve, reject) => {
    const latencies: number[] = [];
    const errorSamples: string[] = [];
    let bytes = 0;
    let unreadable = 0;
    const instance = autocannon(
      {
        url: base,
        connections,
        duration: seconds,
        timeout: 10,
        requests: kind.requests(""),
        setupClient: (client) => client.setRequests(kind.requests(session())),
        verifyBody: kind.verifyBody,
        ...(rate ? { connectionRate: rate, ignoreCoordinatedOmission: true } : {}),
      },
      (error, result) => (error ? reject(error) : resolve({ result: { ...result, non2xx: result.non2xx + unreadable }, latencies, bytes, errorSamples })),
    );
    instance.on("response", (_client, status, size, ms) => {
      latencies.push(ms);
      bytes += size;
      // autocannon counts no status it cannot read (a response cut off by a timeout's reconnect) in non2xx.
      if (!(Number(status) >= 100)) unreadable += 1;
      if (!(Number(status) >= 200 && Number(status) <= 299) && errorSamples.length < 3) errorSamples.push(`HTTP ${status}`);
    });
    instance.on("reqError", (error) => {
      if (errorSamples.length < 3) errorSamples.push(error.message);
    });
  });
}

/**
 * Runs every kind at once for `seconds`. Unpaced (no `rate`): one autocannon instance per kind, each
 * connection sending as soon as it has its answer. Paced: one instance of one connection per
 * connection, `rate` requests a second each, the instances started evenly over the first second
 * (the kinds interleaved), so that the connections' 1-second windows do not all open at once.
 */
async function runLoad(base: string, kinds: Kind[], sessions: string[], seconds: number, rate?: number): Promise<Row[]> {
  let next = 0;
  const session = () => sessions[next++ % sessions.length];
  const active = kinds.filter((k) => k.connections > 0);
  let slots: Array<{ kind: Kind; connections: number; delayMs: number }>;
  if (!rate) {
    slots = active.map((kind) => ({ kind, connections: kind.connections, delayMs: 0 }));
  } else {
    const each = active.flatMap((kind) => Array.from({ length: kind.connections }, (_, i) => ({ kind, key: (i + 0.5) / kind.connections })));
    each.sort((a, b) => a.key - b.key);
    slots = each.map(({ kind }, j) => ({ kind, connections: 1, delayMs: (j * 1000) / each.length }));
  }
  const parts = await Promise.all(
    slots.map(async (slot) => {
      if (slot.delayMs > 0) await sleep(slot.delayMs);
      return { kind: slot.kind, part: await runInstance(base, slot.kind, slot.connections, seconds, session, rate) };
    }),
  );
  return active.map((kind) => {
    const mine = parts.filter((p) => p.kind === kind).map((p) => p.part);
    const statusCodes: Record<string, number> = {};
    for (const p of mine) for (const [code, { count }] of Object.entries(p.result.statusCodeStats)) statusCodes[code] = (statusCodes[code] ?? 0) + count;
    const sum = (f: (p: Part) => number) => mine.reduce((n, p) => n + f(p), 0);
    return {
      name: kind.name,
      conns: kind.connections,
      latencies: mine.flatMap((p) => p.latencies).sort((a, b) => a - b),
      serverTimes: [],
      rate: sum((p) => p.latencies.length / p.result.duration),
      mibps: sum((p) => p.bytes / 2 ** 20 / p.result.duration),
      errors: {
        non2xx: sum((p) => p.result.non2xx),
        socket: sum((p) => p.result.errors - p.result.timeouts),
        timeouts: sum((p) => p.result.timeouts),
        body: sum((p) => p.result.mismatches),
      },
      statusCodes,
      errorSamples: mine.flatMap((p) => p.errorSamples).slice(0, 3),
    };
  });
}

const errorCount = (e: Errors) => e.non2xx + e.socket + e.timeouts + e.body;

function combine(name: string, parts: Row[]): Row {
  const sum = (f: (r: Row) => number) => parts.reduce((n, r) => n + f(r), 0);
  return {
    name,
    conns: sum((r) => r.conns),
    latencies: parts.flatMap((r) => r.latencies).sort((a, b) => a - b),
    serverTimes: parts.flatMap((r) => r.serverTimes).sort((a, b) => a - b),
    rate: sum((r) => r.rate),
    mibps: sum((r) => r.mibps),
    errors: { non2xx: sum((r) => r.errors.non2xx), socket: sum((r) => r.errors.socket), timeouts: sum((r) => r.errors.timeouts), body: sum((r) => r.errors.body) },
    statusCodes: {},
    errorSamples: [],
  };
}

// ---------------------------------------------------------------- phases

interface Phase {
  name: "paced" | "saturation";
  /** Requests a second per connection (paced). */
  rate?: number;
  seconds: number;
  rows: Row[];
  /** The rows, with "job reads" (both reads) and "overall" added. */
  table: Row[];
  server: BenchLoadStats;
  rss: { peak: number; mean: number; hwmAfter: number };
  contention: Contention;
  generatorCpu: number;
  loadAfter: string;
}

const loadAverage = () => os.loadavg().map((l) => l.toFixed(2)).join(" ");

function printPhase(phase: Phase, connections: number) {
  const overall = phase.table.at(-1)!;
  if (phase.rate) {
    const offered = connections * phase.rate;
    console.log(
      `\n=== paced phase: ${connections} connections × ${phase.rate} req/s each (staggered), ${phase.seconds} s — ` +
        `offered ${offered.toFixed(1)} req/s, achieved ${overall.rate.toFixed(1)} req/s (${((overall.rate / offered) * 100).toFixed(0)} %)`,
    );
  } else {
    console.log(`\n=== saturation phase (capacity): ${connections} connections, no pacing, ${phase.seconds} s — ${overall.rate.toFixed(1)} req/s`);
  }
  const header = ["kind", "conns", "requests", "req/s", "p50 ms", "p95 ms", "p99 ms", "max ms", "errors", "MiB/s", "srv p50", "srv p95", "srv p99"];
  const lines = phase.table.map((r) => [
    r.name,
    String(r.conns),
    String(r.latencies.length),
    r.rate.toFixed(1),
    fmtMs(quantile(r.latencies, 50)),
    fmtMs(quantile(r.latencies, 95)),
    fmtMs(quantile(r.latencies, 99)),
    fmtMs(r.latencies.at(-1) ?? Number.NaN),
    String(errorCount(r.errors)),
    r.mibps.toFixed(2),
    fmtMs(quantile(r.serverTimes, 50)),
    fmtMs(quantile(r.serverTimes, 95)),
    fmtMs(quantile(r.serverTimes, 99)),
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)));
  const print = (cells: string[]) => console.log(cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  "));
  print(header);
  print(widths.map((w) => "-".repeat(w)));
  lines.forEach((l, i) => {
    if (phase.table[i].name === "overall") print(widths.map((w) => "-".repeat(w)));
    print(l);
  });
  console.log(
    "(p50…max: at the load generator, request written → response read; srv: in the server, Node's request event → response finished — " +
      "not the time a request waited in its socket while the event loop was busy)",
  );

  const mean = overall.latencies.reduce((a, b) => a + b, 0) / Math.max(1, overall.latencies.length);
  if (phase.rate) {
    const paceMs = 1000 / phase.rate;
    const late = overall.latencies.filter((ms) => ms > paceMs).length;
    console.log(
      `answers slower than the pace (${fmtMs(paceMs)} ms): ${late}` +
        (late ? " — each delays its connection's next request; that wait is in no latency above" : "") +
        `; server busy: ${((phase.server.cpuMs / 1000 / phase.server.seconds) * 100).toFixed(0)} % of one core (below)`,
    );
  } else {
    console.log(
      `closed loop (no think time): mean latency ≈ connections ÷ throughput = ${overall.conns} ÷ ${overall.rate.toFixed(1)} req/s = ${((overall.conns / overall.rate) * 1000).toFixed(0)} ms ` +
        `(measured mean ${mean.toFixed(0)} ms)`,
    );
  }
  const e = overall.errors;
  console.log(`errors: ${e.non2xx} non-2xx, ${e.socket} socket errors, ${e.timeouts} timeouts (10 s), ${e.body} wrong bodies`);
  for (const r of phase.rows) if (r.errorSamples.length) console.log(`  ${r.name}: ${r.errorSamples.join("; ")}`);
  for (const r of phase.rows) {
    if (Object.keys(r.statusCodes).some((c) => c !== "200")) console.log(`  ${r.name} status codes: ${Object.entries(r.statusCodes).map(([code, n]) => `${code}×${n}`).join(" ")}`);
  }

  const server = phase.server;
  console.log(`server memory: RSS peak ${mib(phase.rss.peak)} in this phase (mean ${mib(phase.rss.mean)}, VmRSS sampled every ${RSS_SAMPLE_MS} ms); VmHWM after it ${mib(phase.rss.hwmAfter)}`);
  console.log(
    `server process: ${((server.cpuMs / 1000 / server.seconds) * 100).toFixed(0)} % of one core (${(server.cpuMs / 1000).toFixed(1)} s CPU in ${server.seconds.toFixed(1)} s, ` +
      `${(server.cpuMs / Math.max(1, overall.latencies.length)).toFixed(1)} ms per response); ` +
      `event-loop delay p50 ${fmtMs(server.loopDelay.p50)} ms, p99 ${fmtMs(server.loopDelay.p99)} ms, max ${fmtMs(server.loopDelay.max)} ms; ` +
      `pool ${server.poolWaiting.size} connections, queries waiting for one: mean ${server.poolWaiting.mean.toFixed(1)}, max ${server.poolWaiting.max}`,
  );
  if (server.queries) {
    const responses = overall.latencies.length;
    const total = Object.values(server.queries).reduce((n, q) => n + q.count, 0);
    console.log(`server queries (BENCH_TRACE_QUERIES=1): ${(total / responses).toFixed(1)} per response; by kind — count per response, mean ms from sent to answered:`);
    for (const [kind, q] of Object.entries(server.queries).sort((a, b) => b[1].count - a[1].count)) {
      console.log(`  ${kind.padEnd(30)} ${(q.count / responses).toFixed(2).padStart(6)}  ${(q.ms / q.count).toFixed(1).padStart(7)} ms`);
    }
  }
  const c = phase.contention;
  const ratio = (x: { runMs: number; waitMs: number }) => `ran ${(x.runMs / 1000).toFixed(1)} s, waited ${(x.waitMs / 1000).toFixed(1)} s for a core (${(x.waitMs / Math.max(1, x.runMs)).toFixed(2)} ms per ms run)`;
  console.log(
    `CPU contention (/proc schedstat): server main thread ${ratio(c.server)}; all ${c.serverAll.threads} of its threads ${ratio(c.serverAll)}; ` +
      `PostgreSQL (${c.postgres.threads} backends of runwright_bench_load) ${ratio(c.postgres)}; ` +
      `machine: ${c.machine.busyPercent.toFixed(0)} % of ${os.cpus().length} cores busy (steal ${c.machine.stealPercent.toFixed(1)} %), ` +
      `some task waiting for a core ${c.machine.psiSomePercent.toFixed(0)} % of the time (PSI)`,
  );
  console.log(`load generator (this process): ${phase.generatorCpu.toFixed(0)} % of one core; load average after the phase: ${phase.loadAfter}`);
}

// ---------------------------------------------------------------- main

async function main() {
  const seconds = setting("duration", 60, 1, 600);
  const rate = setting("rate", 1, 1, 100, true);
  const saturationSeconds = setting("saturation-duration", 20, 0, 600);
  const connections = setting("connections", 50, 1, 500);
  const warmup = setting("warmup", 5, 0, 120);
  const users = setting("users", 50, 1, 500);
  const weights = mixSetting();
  const [listConns, detailConns, solveConns, pdfConns] = split(connections, weights);

  const cpus = os.cpus();
  console.log(`bench:load — ${new Date().toISOString()}`);
  console.log(`machine: ${cpus.length} cores (${cpus[0]?.model.trim() ?? "?"}), ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB, ${os.platform()} ${os.release()}; node ${process.version}`);
  console.log(`load average before: ${loadAverage()}`);
  console.log(
    `plan: ${connections} connections (jobs list ${listConns}, job detail ${detailConns}, solve ${solveConns}, quote PDF ${pdfConns}), ${users} users; ` +
      `${warmup} s warm-up, ${seconds} s paced at ${rate} req/s per connection (${connections * rate} req/s offered)` +
      (saturationSeconds > 0 ? `, ${saturationSeconds} s saturation (no pacing)` : ", no saturation phase"),
  );

  const started = Date.now();
  const child = await startChild(users);
  const pid = child.process.pid!;
  const contention = contentionMeter(pid, "runwright_bench_load");
  const rss = { peak: 0, phase: undefined as number[] | undefined };
  const sampler = setInterval(() => {
    const kib = procStatus(pid, "VmRSS");
    if (Number.isNaN(kib)) return;
    rss.peak = Math.max(rss.peak, kib);
    rss.phase?.push(kib);
  }, RSS_SAMPLE_MS);
  const interrupted = () => {
    clearInterval(sampler);
    void child.stop().then(() => process.exit(130));
  };
  process.once("SIGINT", interrupted);
  process.once("SIGTERM", interrupted);

  try {
    const { url: base, emails, password, jobIds, systemId, quoteId } = child.ready;
    console.log(`server: pid ${pid} on ${base}, ready in ${((Date.now() - started) / 1000).toFixed(1)} s (database runwright_bench_load, seeded); RSS ${mib(procStatus(pid, "VmRSS"))}`);

    // One session per person, signed in over HTTP (argon2 verify each), four at a time.
    const sessions: string[] = new Array(users);
    const signInStart = Date.now();
    for (let i = 0; i < users; i += 4) {
      await Promise.all(emails.slice(i, i + 4).map(async (email, j) => (sessions[i + j] = await signIn(base, email, password))));
    }
    console.log(`sessions: ${sessions.length} people signed in in ${((Date.now() - signInStart) / 1000).toFixed(1)} s`);

    // The solve posts the system's saved document, as the editor does.
    const get = async (p: string) => {
      const response = await fetch(`${base}${p}`, { headers: { Cookie: sessions[0] } });
      if (!response.ok) throw new Error(`GET ${p}: ${response.status}`);
      return response;
    };
    const saved = (await (await get(`/api/systems/${systemId}`)).json()) as { document: { loads: unknown[]; runs: unknown[] } };
    const solveBody = JSON.stringify({ document: saved.document });
    const pdf = Buffer.from(await (await get(`/api/quotes/${quoteId}/pdf`)).arrayBuffer());
    const jobsList = (await (await get(`/api/jobs`)).json()) as { items: unknown[]; total?: number };
    console.log(
      `data: ${jobIds.length} jobs (the list answers ${jobsList.items.length} a page); solve body ${(solveBody.length / 1024).toFixed(0)} KiB ` +
        `(${saved.document.loads.length} loads, ${saved.document.runs.length} runs); quote PDF ${(pdf.length / 1024).toFixed(0)} KiB, ${/\/Type \/Pages\s*\/Count (\d+)/.exec(pdf.toString("latin1"))?.[1] ?? "?"} pages`,
    );

    const getReq = (p: string, cookie: string): AutocannonRequest => ({ method: "GET", path: p, headers: { Cookie: cookie } });
    let nextJob = 0;
    const kinds: Kind[] = [
      { name: "jobs list", connections: listConns, requests: (cookie) => [getReq("/api/jobs", cookie)] },
      {
        name: "job detail",
        connections: detailConns,
        requests: (cookie) => [
          {
            ...getReq(`/api/jobs/${jobIds[0]}`, cookie),
            setupRequest: (request) => ({ ...request, path: `/api/jobs/${jobIds[nextJob++ % jobIds.length]}` }),
          },
        ],
      },
      {
        name: "solve",
        connections: solveConns,
        requests: (cookie) => [
          { method: "POST", path: `/api/systems/${systemId}/solve`, headers: { Cookie: cookie, "Content-Type": "application/json", [CSRF_HEADER]: "1" }, body: solveBody },
        ],
        verifyBody: (body) => body.startsWith('{"ok":true'),
      },
      {
        name: "quote PDF",
        connections: pdfConns,
        requests: (cookie) => [getReq(`/api/quotes/${quoteId}/pdf`, cookie)],
        verifyBody: (body) => body.startsWith("%PDF-"),
      },
    ];

    if (warmup > 0) {
      process.stdout.write(`warm-up: ${warmup} s unpaced… `);
      const w = await runLoad(base, kinds, sessions, warmup);
      console.log(`${w.reduce((n, r) => n + r.latencies.length, 0)} responses`);
      await sleep(SETTLE_MS);
    }

    const measurePhase = async (name: Phase["name"], phaseSeconds: number, phaseRate?: number): Promise<Phase> => {
      process.stdout.write(`${name}: ${phaseSeconds} s${phaseRate ? ` at ${phaseRate} req/s per connection` : ", no pacing"}… `);
      child.measure();
      contention.start();
      const contentionSampler = setInterval(() => contention.sample(), 1000);
      const samples: number[] = [];
      rss.phase = samples;
      const generatorCpu = process.cpuUsage();
      const generatorStart = performance.now();
      const rows = await runLoad(base, kinds, sessions, phaseSeconds, phaseRate);
      const generatorUsed = process.cpuUsage(generatorCpu);
      const generatorSeconds = (performance.now() - generatorStart) / 1000;
      rss.phase = undefined;
      clearInterval(contentionSampler);
      const contended = contention.stop();
      const server = await child.stats();
      console.log("done");
      for (const row of rows) row.serverTimes = [...(server.serverTime[row.name] ?? [])].sort((a, b) => a - b);
      const reads = rows.filter((r) => r.name === "jobs list" || r.name === "job detail");
      const table = [...rows.slice(0, 2), ...(reads.length === 2 ? [combine("job reads", reads)] : []), ...rows.slice(2), combine("overall", rows)];
      return {
        name,
        rate: phaseRate,
        seconds: phaseSeconds,
        rows,
        table,
        server,
        rss: { peak: samples.length ? Math.max(...samples) : Number.NaN, mean: samples.length ? samples.reduce((a, b) => a + b, 0) / samples.length : Number.NaN, hwmAfter: procStatus(pid, "VmHWM") },
        contention: contended,
        generatorCpu: ((generatorUsed.user + generatorUsed.system) / 1e6 / generatorSeconds) * 100,
        loadAfter: loadAverage(),
      };
    };

    const paced = await measurePhase("paced", seconds, rate);
    const saturation = saturationSeconds > 0 ? await measurePhase("saturation", saturationSeconds) : undefined;

    printPhase(paced, connections);
    if (saturation) printPhase(saturation, connections);

    console.log(
      `\nserver memory over the whole run: VmHWM ${mib(procStatus(pid, "VmHWM"))} (the process's peak resident memory since it started, seeding included); ` +
        `sampled VmRSS peak ${mib(rss.peak)}`,
    );
    console.log(`load average at the end: ${loadAverage()}`);

    // ---- targets: judged on the paced phase; the saturation phase's figures beside them, for what they are
    const p95 = (phase: Phase, name: string) => quantile(phase.table.find((r) => r.name === name)?.latencies ?? [], 95);
    const errors = (phase: Phase) => errorCount(phase.table.at(-1)!.errors);
    const verdict = (ok: boolean) => (ok ? "met" : "MISSED");
    const cells: Array<[string, string, string]> = [
      ["no errors", errors(paced) === 0 ? "met" : `MISSED (${errors(paced)})`, saturation ? `${errors(saturation)} errors` : ""],
      [
        `solve p95 ≤ ${TARGET_SOLVE_P95_MS} ms`,
        solveConns ? `${verdict(p95(paced, "solve") <= TARGET_SOLVE_P95_MS)} (${fmtMs(p95(paced, "solve"))} ms)` : "not measured",
        saturation && solveConns ? `p95 ${fmtMs(p95(saturation, "solve"))} ms` : "",
      ],
      [
        `quote PDF p95 ≤ ${TARGET_PDF_P95_MS} ms`,
        pdfConns ? `${verdict(p95(paced, "quote PDF") <= TARGET_PDF_P95_MS)} (${fmtMs(p95(paced, "quote PDF"))} ms)` : "not measured",
        saturation && pdfConns ? `p95 ${fmtMs(p95(saturation, "quote PDF"))} ms` : "",
      ],
    ];
    const title = `targets (paced phase: ${connections} clients × ${rate} req/s)`;
    const w0 = Math.max(...cells.map((c) => c[0].length)) + 2;
    const w1 = Math.max(title.length - w0 - 2, ...cells.map((c) => c[1].length)) + 2;
    console.log(`\n${title.padEnd(w0 + w1 + 2)}${saturation ? `at saturation (${saturation.table.at(-1)!.rate.toFixed(0)} req/s; not the target's scenario)` : ""}`.trimEnd());
    for (const [what, met, sat] of cells) console.log(`  ${what.padEnd(w0)}${met.padEnd(w1)}${sat}`.trimEnd());
    const pacedOverall = paced.table.at(-1)!;
    if (pacedOverall.rate < 0.95 * connections * rate) {
      console.log(`  (the server answered ${pacedOverall.rate.toFixed(1)} of ${connections * rate} req/s offered: it did not keep up, so the paced latencies understate)`);
    }
    if (child.ready.devCluster) console.log("\n(the development cluster keeps running; `npm run db -- stop` stops it)");
  } finally {
    clearInterval(sampler);
    await child.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
