// npm run bench:load: the server under load from many signed-in people at once — a benchmark, not a
// test. It prints figures and whether each target is met, and never fails on a missed target (the
// exit code is 0 unless the script itself breaks).
//
// What it does: starts the server in a child process (bench-load-server.ts, run with node --import
// tsx: its own event loop, its own memory), which makes the database "runwright_bench_load" afresh
// in the development cluster, seeds a company with BENCH_USERS people (default 50), 31 jobs and a
// sent quote of a 200-load system, and serves createApp on 127.0.0.1. This process signs every
// person in over HTTP (one session each) and then runs four autocannon instances at once, their
// connections adding up to BENCH_CONNECTIONS (default 50; each connection carries its own
// session cookie, and the CSRF header on POST), for BENCH_DURATION seconds (default 60) after a
// BENCH_WARMUP-second warm-up (default 5, not counted):
//   jobs list   GET  /api/jobs                        30 %
//   job detail  GET  /api/jobs/:id (31 jobs in turn)  30 %
//   solve       POST /api/systems/:id/solve           20 %  the 200-load system's saved document
//   quote PDF   GET  /api/quotes/:id/pdf              20 %  the sent quote of that system
// (BENCH_MIX=15,15,10,10 sets the weights.) Every connection sends its next request as soon as the
// answer arrives (no think time), so the server is saturated and latency includes queueing.
// Latency is timed per response by autocannon (request written → response complete) and kept
// whole here, so p50/p95/p99 are exact. Errors: non-2xx answers + socket errors (timeouts, 10 s,
// among them) + answers whose body is wrong (a PDF not starting with %PDF-, a solve not {"ok":true…).
// The server's memory: /proc/<pid>/status VmRSS sampled every 200 ms, and VmHWM at the end.
// Targets (the issue): no errors; solve p95 ≤ 100 ms; quote PDF p95 ≤ 500 ms.
//
// Options: BENCH_DURATION / --duration (s), BENCH_CONNECTIONS / --connections, BENCH_WARMUP /
// --warmup (s), BENCH_MIX / --mix, BENCH_USERS / --users. E.g. BENCH_DURATION=10 npm run bench:load.
// Diagnosis: BENCH_TRACE_QUERIES=1 counts and times the server's queries by kind; BENCH_CPU_PROF=<folder>
// has the server write a V8 CPU profile (.cpuprofile) there when it stops.
// Figures are for the machine it runs on; the load generator, PostgreSQL and the server share its
// cores, so compare them only with figures from the same machine, and mind what else is running
// (the load average is printed before and after).
import { type ChildProcess, spawn } from "node:child_process";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
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
}
type Autocannon = (options: AutocannonOptions, done: (error: Error | null, result: AutocannonResult) => void) => AutocannonInstance;
const autocannon = createRequire(import.meta.url)("autocannon") as Autocannon;

const TARGET_SOLVE_P95_MS = 100;
const TARGET_PDF_P95_MS = 500;
const RSS_SAMPLE_MS = 200;

// ---------------------------------------------------------------- settings

function setting(name: string, fallback: number, min: number, max: number): number {
  const flag = `--${name}`;
  const args = process.argv.slice(2);
  let raw: string | undefined = process.env[`BENCH_${name.toUpperCase()}`];
  for (let i = 0; i < args.length; i++) {
    if (args[i] === flag) raw = args[i + 1];
    else if (args[i].startsWith(`${flag}=`)) raw = args[i].slice(flag.length + 1);
  }
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value < min || value > max) throw new Error(`${flag} / BENCH_${name.toUpperCase()}: ${raw} is not a number from ${min} to ${max}`);
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

interface KindRun {
  kind: Kind;
  result: AutocannonResult;
  latencies: number[];
  bytes: number;
  errorSamples: string[];
}

/** Runs every kind at once for `seconds`; each connection gets the next session in turn. */
async function runLoad(base: string, kinds: Kind[], sessions: string[], seconds: number): Promise<KindRun[]> {
  let next = 0;
  return Promise.all(
    kinds
      .filter((k) => k.connections > 0)
      .map(
        (kind) =>
          new Promise<KindRun>((resolve, reject) => {
            const latencies: number[] = [];
            const errorSamples: string[] = [];
            let bytes = 0;
            let unreadable = 0;
            const instance = autocannon(
              {
                url: base,
                connections: kind.connections,
                duration: seconds,
                timeout: 10,
                requests: kind.requests(sessions[0]),
                setupClient: (client) => client.setRequests(kind.requests(sessions[next++ % sessions.length])),
                verifyBody: kind.verifyBody,
              },
              (error, result) => (error ? reject(error) : resolve({ kind, result: { ...result, non2xx: result.non2xx + unreadable }, latencies, bytes, errorSamples })),
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
          }),
      ),
  );
}

// ---------------------------------------------------------------- main

async function main() {
  const seconds = setting("duration", 60, 1, 600);
  const connections = setting("connections", 50, 1, 500);
  const warmup = setting("warmup", 5, 0, 120);
  const users = setting("users", 50, 1, 500);
  const weights = mixSetting();
  const [listConns, detailConns, solveConns, pdfConns] = split(connections, weights);

  const load = () => os.loadavg().map((l) => l.toFixed(2)).join(" ");
  const cpus = os.cpus();
  console.log(`bench:load — ${new Date().toISOString()}`);
  console.log(`machine: ${cpus.length} cores (${cpus[0]?.model.trim() ?? "?"}), ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB, ${os.platform()} ${os.release()}; node ${process.version}`);
  console.log(`load average before: ${load()}`);
  console.log(`plan: ${connections} connections (jobs list ${listConns}, job detail ${detailConns}, solve ${solveConns}, quote PDF ${pdfConns}), ${users} users, ${warmup} s warm-up + ${seconds} s measured`);

  const started = Date.now();
  const child = await startChild(users);
  const pid = child.process.pid!;
  const rss = { peak: 0, peakMeasured: 0, samples: [] as number[], measuring: false };
  const sampler = setInterval(() => {
    const kib = procStatus(pid, "VmRSS");
    if (Number.isNaN(kib)) return;
    rss.peak = Math.max(rss.peak, kib);
    if (rss.measuring) {
      rss.peakMeasured = Math.max(rss.peakMeasured, kib);
      rss.samples.push(kib);
    }
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
      process.stdout.write(`warm-up: ${warmup} s… `);
      const w = await runLoad(base, kinds, sessions, warmup);
      console.log(`${w.reduce((n, r) => n + r.latencies.length, 0)} responses`);
    }

    process.stdout.write(`measuring: ${seconds} s… `);
    child.measure();
    rss.measuring = true;
    const generatorCpu = process.cpuUsage();
    const runs = await runLoad(base, kinds, sessions, seconds);
    const generatorUsed = process.cpuUsage(generatorCpu);
    rss.measuring = false;
    const server = await child.stats();
    console.log("done\n");

    // ---- the table
    const rows: Array<{ name: string; conns: number; latencies: number[]; seconds: number; errors: { non2xx: number; socket: number; timeouts: number; body: number }; mibps: number }> = [];
    for (const r of runs) {
      rows.push({
        name: r.kind.name,
        conns: r.kind.connections,
        latencies: [...r.latencies].sort((a, b) => a - b),
        seconds: r.result.duration,
        errors: { non2xx: r.result.non2xx, socket: r.result.errors - r.result.timeouts, timeouts: r.result.timeouts, body: r.result.mismatches },
        mibps: r.bytes / 2 ** 20 / r.result.duration,
      });
    }
    const combine = (name: string, parts: typeof rows) => ({
      name,
      conns: parts.reduce((n, r) => n + r.conns, 0),
      latencies: parts.flatMap((r) => r.latencies).sort((a, b) => a - b),
      seconds: Math.max(...parts.map((r) => r.seconds)),
      errors: {
        non2xx: parts.reduce((n, r) => n + r.errors.non2xx, 0),
        socket: parts.reduce((n, r) => n + r.errors.socket, 0),
        timeouts: parts.reduce((n, r) => n + r.errors.timeouts, 0),
        body: parts.reduce((n, r) => n + r.errors.body, 0),
      },
      mibps: parts.reduce((n, r) => n + r.mibps, 0),
    });
    const reads = rows.filter((r) => r.name === "jobs list" || r.name === "job detail");
    const table = [...rows.slice(0, 2), ...(reads.length === 2 ? [combine("job reads", reads)] : []), ...rows.slice(2), combine("overall", rows)];
    const header = ["kind", "conns", "requests", "req/s", "p50 ms", "p95 ms", "p99 ms", "max ms", "errors", "MiB/s"];
    const lines = table.map((r) => {
      const errors = r.errors.non2xx + r.errors.socket + r.errors.timeouts + r.errors.body;
      return [
        r.name,
        String(r.conns),
        String(r.latencies.length),
        (r.latencies.length / r.seconds).toFixed(1),
        fmtMs(quantile(r.latencies, 50)),
        fmtMs(quantile(r.latencies, 95)),
        fmtMs(quantile(r.latencies, 99)),
        fmtMs(r.latencies.at(-1) ?? Number.NaN),
        String(errors),
        r.mibps.toFixed(2),
      ];
    });
    const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)));
    const print = (cells: string[]) => console.log(cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  "));
    print(header);
    print(widths.map((w) => "-".repeat(w)));
    lines.forEach((l, i) => {
      if (table[i].name === "overall") print(widths.map((w) => "-".repeat(w)));
      print(l);
    });

    const overall = table.at(-1)!;
    const throughput = overall.latencies.length / overall.seconds;
    console.log(
      `\nclosed loop (no think time): mean latency ≈ connections ÷ throughput = ${overall.conns} ÷ ${throughput.toFixed(1)} req/s = ${((overall.conns / throughput) * 1000).toFixed(0)} ms ` +
        `(measured mean ${(overall.latencies.reduce((a, b) => a + b, 0) / Math.max(1, overall.latencies.length)).toFixed(0)} ms)`,
    );
    const e = overall.errors;
    console.log(`errors: ${e.non2xx} non-2xx, ${e.socket} socket errors, ${e.timeouts} timeouts (10 s), ${e.body} wrong bodies`);
    for (const r of runs) if (r.errorSamples.length) console.log(`  ${r.kind.name}: ${r.errorSamples.join("; ")}`);
    for (const r of runs) {
      const codes = Object.entries(r.result.statusCodeStats).map(([code, { count }]) => `${code}×${count}`).join(" ");
      if (codes && Object.keys(r.result.statusCodeStats).some((c) => c !== "200")) console.log(`  ${r.kind.name} status codes: ${codes}`);
    }

    const hwm = procStatus(pid, "VmHWM");
    const meanRss = rss.samples.length ? rss.samples.reduce((a, b) => a + b, 0) / rss.samples.length : Number.NaN;
    console.log(
      `server memory: RSS peak ${mib(rss.peakMeasured)} while measured (mean ${mib(meanRss)}, sampled every ${RSS_SAMPLE_MS} ms), ` +
        `${mib(rss.peak)} over the whole run; VmHWM ${mib(hwm)}`,
    );
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
    console.log(`load generator (this process): ${(((generatorUsed.user + generatorUsed.system) / 1e6 / seconds) * 100).toFixed(0)} % of one core`);
    console.log(`load average after: ${load()}`);

    // ---- targets
    const p95 = (name: string) => quantile(table.find((r) => r.name === name)?.latencies ?? [], 95);
    const errors = e.non2xx + e.socket + e.timeouts + e.body;
    const verdict = (ok: boolean) => (ok ? "met" : "MISSED");
    console.log("\ntargets:");
    console.log(`  no errors                 ${errors === 0 ? "met" : `MISSED (${errors})`}`);
    console.log(`  solve p95 ≤ ${TARGET_SOLVE_P95_MS} ms        ${solveConns ? `${verdict(p95("solve") <= TARGET_SOLVE_P95_MS)} (${fmtMs(p95("solve"))} ms)` : "not measured"}`);
    console.log(`  quote PDF p95 ≤ ${TARGET_PDF_P95_MS} ms    ${pdfConns ? `${verdict(p95("quote PDF") <= TARGET_PDF_P95_MS)} (${fmtMs(p95("quote PDF"))} ms)` : "not measured"}`);
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
