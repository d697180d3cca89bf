/// <reference lib="dom" />
// npm run bench:editor: the System editor's responsiveness with 500 loads, measured in Debian's
// Chromium — a benchmark, not a test. It prints figures and never fails on a missed target (exit
// code 0 unless the script itself breaks).
//
// What it does: builds the client with vite into a temporary folder, opens the development cluster
// (as `npm start` does; its own database "runwright_bench_editor", dropped and made afresh, dropped
// again at the end), migrates it, serves the real app with the built client (createApp, sessions in
// PostgreSQL) on 127.0.0.1, signs up a company over HTTP, creates a job and a system with a generated
// 500-load network, then drives headless Chromium (playwright-core): signs in through the sign-in
// page, opens the system and measures, inside the page:
//   1. opening: from navigation start to the first frame showing the solved results (the loads table's first 50 rows);
//   2. typing in a cell: keydown → the frame after the input's value changed, per key;
//   3. typing in a cell while a solve is in flight (a commit with Enter, then typing at once in the
//      cell Enter moved to), each key put in the phase it fell in;
//   4. a commit with Enter → the results showing the new value ("Updating…" gone), split into the
//      debounce, the solve round trip (PerformanceResourceTiming) and the page's work on the answer;
// then diagnostics of where the page's time goes: long animation frames (script by invoker, forced
// layout, rendering), Chrome traces (main-thread self time by event), and the same typing and
// commits with the diagram hidden by CSS and/or the results on their Findings tab (no 500-row table).
// The machine is shared (and may be busy): compare figures from one run with each other.
// Issue 5: "the editor stays responsive with 500 loads (typing in a cell never waits for a solve)".
// Client and server share this machine (and the server this process), so the figures include both.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { buildClient } from "./build-client.js";
import { CHROMIUM_ARGS, CHROMIUM_PATH } from "./chromium.js";
import { network, startBenchApp } from "./bench-support.js";

const BENCH_DB = "runwright_bench_editor";
const EMAIL = "bench@bench.test";
const PASSWORD = "bench-password-2026";
/** Characters typed per round, and the gap between keydowns (a quick typist: 20 keys a second). */
const TYPED = "12345678901234567890";
const KEY_GAP_MS = 50;
const ROUNDS = 3;
/** Rounds of scenario 3: more, because only a few keys of each fall while the request is in flight. */
const SOLVE_ROUNDS = 5;

// ---- In the page -------------------------------------------------------------------------------

interface KeyRecord {
  key: string;
  /** The focused input's aria-label. */
  cell: string;
  /** event.timeStamp of the keydown (when the browser took the key; includes any wait for the main thread). */
  down: number;
  /** When the page's first keydown listener ran. */
  handled: number;
  /** The input event (the value changed); absent for Enter. */
  input?: number;
  /** The next animation frame after the input event (requestAnimationFrame). */
  frame?: number;
  /** After that frame's style, layout and paint (a message posted from the frame callback). */
  painted?: number;
  value?: string;
}

interface FrameRecord {
  start: number;
  duration: number;
  blocking: number;
  /** Where the frame's style/layout/paint began (0: none). */
  renderStart: number;
  styleAndLayoutStart: number;
  scripts: Array<{ invoker: string; type: string; duration: number; layout: number; source: string }>;
}

interface EventRecord {
  name: string;
  start: number;
  duration: number;
  processingStart: number;
  processingEnd: number;
  cell: string;
}

interface Harness {
  probe: boolean;
  keys: KeyRecord[];
  frames: FrameRecord[];
  events: EventRecord[];
  /** Opening: the first frame with the solved results shown and no solve pending. */
  opened: { frame: number; painted?: number } | null;
  /** A commit: when the results went stale, and the first frame after that where they were fresh again. */
  watch: { stale: number | null; fresh: number | null; painted: number | null } | null;
  startWatch(): void;
}

declare global {
  interface Window {
    __bench: Harness;
  }
}

/** Installed before the app's own scripts on every page (addInitScript). */
function installHarness(expectLoads: number) {
  const afterPaint = (then: (t: number) => void) => {
    const channel = new MessageChannel();
    channel.port1.onmessage = () => then(performance.now());
    channel.port2.postMessage(0);
  };
  const resultsSection = () =>
    [...document.querySelectorAll<HTMLElement>("section[aria-busy]")].find((s) => s.querySelector("h2")?.textContent?.trim() === "Results") ?? null;
  const h: Harness = {
    probe: false,
    keys: [],
    frames: [],
    events: [],
    opened: null,
    watch: null,
    startWatch() {
      const w = { stale: null as number | null, fresh: null as number | null, painted: null as number | null };
      h.watch = w;
      const tick = () => {
        if (h.watch !== w) return;
        const busy = resultsSection()?.getAttribute("aria-busy") === "true";
        const now = performance.now();
        if (busy && w.stale === null) w.stale = now;
        if (!busy && w.stale !== null) {
          w.fresh = now;
          afterPaint((t) => (w.painted = t));
          return;
        }
        requestAnimationFrame(tick);
      };
      requestAnimationFrame(tick);
    },
  };
  window.__bench = h;

  document.addEventListener(
    "keydown",
    (e) => {
      if (!h.probe || !(e.target instanceof HTMLInputElement)) return;
      h.keys.push({ key: e.key, cell: e.target.getAttribute("aria-label") ?? "", down: e.timeStamp, handled: performance.now() });
    },
    true,
  );
  document.addEventListener(
    "input",
    (e) => {
      const rec = h.keys.at(-1);
      if (!h.probe || !rec || rec.input !== undefined || !(e.target instanceof HTMLInputElement)) return;
      const input = e.target;
      rec.input = performance.now();
      requestAnimationFrame(() => {
        rec.frame = performance.now();
        rec.value = input.value;
        afterPaint((t) => (rec.painted = t));
      });
    },
    true,
  );

  try {
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) {
        const e = entry as PerformanceEntry & {
          blockingDuration: number;
          renderStart: number;
          styleAndLayoutStart: number;
          scripts: Array<{ invoker: string; invokerType: string; duration: number; forcedStyleAndLayoutDuration: number; sourceURL: string; sourceFunctionName: string }>;
        };
        h.frames.push({
          start: e.startTime,
          duration: e.duration,
          blocking: e.blockingDuration,
          renderStart: e.renderStart,
          styleAndLayoutStart: e.styleAndLayoutStart,
          scripts: e.scripts.map((s) => ({
            invoker: s.invoker,
            type: s.invokerType,
            duration: s.duration,
            layout: s.forcedStyleAndLayoutDuration,
            source: `${s.sourceURL.replace(/^.*\//, "")}${s.sourceFunctionName ? `:${s.sourceFunctionName}` : ""}`,
          })),
        });
      }
    }).observe({ type: "long-animation-frame", buffered: true });
  } catch {
    // No Long Animation Frames API: the breakdown is left out.
  }
  try {
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) {
        const e = entry as PerformanceEventTiming;
        const target = e.target instanceof Element ? (e.target.getAttribute("aria-label") ?? e.target.tagName) : "";
        h.events.push({ name: e.name, start: e.startTime, duration: e.duration, processingStart: e.processingStart, processingEnd: e.processingEnd, cell: target });
      }
    }).observe({ type: "event", durationThreshold: 16, buffered: true } as PerformanceObserverInit);
  } catch {
    // No Event Timing API.
  }

  // Opening a system page: watch every frame until each load shows a status and no solve is pending.
  if (/\/systems\//.test(location.pathname)) {
    const tick = () => {
      const section = resultsSection();
      const shown = section ? section.querySelectorAll("tr[data-load-id][data-status]").length : 0;
      // The results table draws the worst 50 loads (RESULT_ROWS_SHOWN in row-cap.tsx) until asked for all.
      if (shown >= Math.min(expectLoads, 50) && section?.getAttribute("aria-busy") === "false") {
        const opened: Harness["opened"] = { frame: performance.now() };
        h.opened = opened;
        afterPaint((t) => (opened.painted = t));
        return;
      }
      requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  }
}

// ---- Figures ------------------------------------------------------------------------------------

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
const ms = (v: number | undefined) => (v === undefined || Number.isNaN(v) ? "—" : `${v.toFixed(1)} ms`);
function spread(values: number[]): string {
  if (values.length === 0) return "no samples";
  const sorted = [...values].sort((a, b) => a - b);
  return `p50 ${ms(percentile(sorted, 50))}, p95 ${ms(percentile(sorted, 95))}, max ${ms(sorted.at(-1))} (${values.length} keys)`;
}
const median = (values: number[]) => percentile([...values].sort((a, b) => a - b), 50);

/** Chrome's Event Timing entries (≥ 16 ms: event → next paint, 8 ms granularity) by event type. */
function eventTimingLine(events: EventRecord[], keys: number): string {
  const names = ["keydown", "keypress", "input", "keyup"];
  const parts = names.map((name) => {
    const d = events.filter((e) => e.name === name).map((e) => e.duration);
    return d.length ? `${name} ${d.length}/${keys} (max ${d.length ? Math.max(...d).toFixed(0) : "—"} ms)` : `${name} 0/${keys}`;
  });
  return `Chrome's Event Timing, events taking ≥ 16 ms to the next paint: ${parts.join(", ")}`;
}

/** keydown → painted frame, and how long the key waited for the main thread before any handler ran. */
const latency = (k: KeyRecord) => (k.painted ?? Number.NaN) - k.down;
const queued = (k: KeyRecord) => k.handled - k.down;

/** The long animation frames (≥ 50 ms) overlapping [from, to], summarised: where the main thread went. */
function frameSummary(frames: FrameRecord[], from: number, to: number): string[] {
  const inside = frames.filter((f) => f.start + f.duration >= from && f.start <= to);
  if (inside.length === 0) return ["no long animation frame (≥ 50 ms) in this window"];
  return inside.map((f) => {
    const end = f.start + f.duration;
    const render = f.renderStart > 0 ? end - f.renderStart : 0;
    const layout = f.styleAndLayoutStart > 0 ? end - f.styleAndLayoutStart : 0;
    const script = f.scripts.reduce((a, s) => a + s.duration, 0);
    const forced = f.scripts.reduce((a, s) => a + s.layout, 0);
    const top = [...f.scripts]
      .sort((a, b) => b.duration - a.duration)
      .slice(0, 3)
      .map((s) => `${s.invoker || s.type} ${s.duration.toFixed(0)} ms`)
      .join(", ");
    return (
      `long frame at ${f.start >= from ? "+" : "−"}${Math.abs(f.start - from).toFixed(0)} ms: ${f.duration.toFixed(0)} ms (blocking ${f.blocking.toFixed(0)}); ` +
      `script ${script.toFixed(0)} ms [${top || "none attributed"}]${forced > 0.5 ? `, forced layout in script ${forced.toFixed(0)} ms` : ""}; ` +
      `rendering steps ${render.toFixed(0)} ms (of which style, layout and paint ${layout.toFixed(0)} ms)`
    );
  });
}

// ---- Driving the page -----------------------------------------------------------------------------

/** Two animation frames and a quiet moment: what an earlier step started has been drawn. */
async function settle(page: Page, quietMs = 250) {
  await page.evaluate(() => new Promise<void>((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => resolve()))));
  await sleep(quietMs);
}

const demandCell = (page: Page, loadId: string) => page.locator(`input[aria-label="Watts of load ${loadId}"], input[aria-label="Amps of load ${loadId}"]`);

/** Presses each character at KEY_GAP_MS intervals (later if the page holds a key up), then waits until each is painted. */
async function typeTimed(page: Page, text: string, expected: number) {
  const start = performance.now();
  for (let i = 0; i < text.length; i++) {
    const wait = start + i * KEY_GAP_MS - performance.now();
    if (wait > 0) await sleep(wait);
    await page.keyboard.press(text[i]);
  }
  await page.waitForFunction((n) => window.__bench.keys.filter((k) => k.painted !== undefined).length >= n, expected, { timeout: 30_000 });
}

async function probe(page: Page, on: boolean) {
  await page.evaluate((value) => {
    window.__bench.probe = value;
    if (value) {
      window.__bench.keys = [];
      window.__bench.events = [];
    }
  }, on);
}

const harness = (page: Page) => page.evaluate(() => ({ keys: window.__bench.keys, frames: window.__bench.frames, events: window.__bench.events, watch: window.__bench.watch }));

/** The /solve requests' resource timings since the last clear. */
const solveTimings = (page: Page) =>
  page.evaluate(() =>
    performance
      .getEntriesByType("resource")
      .filter((e) => e.name.endsWith("/solve"))
      .map((e) => {
        const r = e as PerformanceResourceTiming;
        return { start: r.startTime, requestStart: r.requestStart, responseStart: r.responseStart, end: r.responseEnd, bytes: r.encodedBodySize };
      }),
  );

/** The load's row in the results' Loads table, or null when that tab is not shown. */
async function resultRow(page: Page, loadId: string): Promise<string | null> {
  const row = page.locator(`tr[data-load-id="${loadId}"]`).first();
  return (await row.count()) > 0 ? row.innerText() : null;
}

/** Runs the measured part of a step (a tracer wraps it; by default it just runs). */
type Wrap = (act: () => Promise<void>) => Promise<void>;
const plain: Wrap = (act) => act();

/** Types TYPED into each load's demand cell in turn (nothing committed: Escape reverts), measuring every key. */
async function idleTyping(page: Page, loadIds: string[], wrap: Wrap = plain): Promise<{ keys: KeyRecord[]; events: EventRecord[]; frames: FrameRecord[] }> {
  const out = { keys: [] as KeyRecord[], events: [] as EventRecord[], frames: [] as FrameRecord[] };
  for (const loadId of loadIds) {
    const cell = demandCell(page, loadId);
    await cell.focus();
    await page.keyboard.press("Control+A");
    await settle(page);
    await page.evaluate(() => {
      window.__bench.frames = [];
    });
    await probe(page, true);
    await wrap(() => typeTimed(page, TYPED, TYPED.length));
    await settle(page, 100);
    const { keys, events, frames } = await harness(page);
    await probe(page, false);
    const typed = await cell.inputValue();
    if (typed !== TYPED) throw new Error(`${loadId}: the cell holds "${typed}", not "${TYPED}"`);
    await page.keyboard.press("Escape");
    out.keys.push(...keys);
    out.events.push(...events);
    out.frames.push(...frames);
  }
  return out;
}

interface TraceEvent {
  ph: string;
  name: string;
  pid: number;
  tid: number;
  ts: number;
  dur?: number;
  args?: { name?: string };
}

/**
 * Runs `act` under a Chrome trace and returns the renderer main thread's self time by trace event
 * name (script, style, layout, paint…), and the raster threads' time, in ms.
 */
async function traced(page: Page, act: () => Promise<void>): Promise<{ main: Map<string, number>; others: number; wall: number }> {
  const cdp = await page.context().newCDPSession(page);
  const events: TraceEvent[] = [];
  cdp.on("Tracing.dataCollected", (data) => void events.push(...(data.value as unknown as TraceEvent[])));
  const done = new Promise<void>((resolve) => cdp.once("Tracing.tracingComplete", () => resolve()));
  await cdp.send("Tracing.start", {
    transferMode: "ReportEvents",
    traceConfig: { includedCategories: ["devtools.timeline", "disabled-by-default-devtools.timeline", "v8.execute", "v8", "blink", "cc", "__metadata"] },
  });
  const started = performance.now();
  await act();
  const wall = performance.now() - started;
  await cdp.send("Tracing.end");
  await done;
  await cdp.detach();

  const threadName = new Map<string, string>();
  for (const e of events) if (e.ph === "M" && e.name === "thread_name") threadName.set(`${e.pid}:${e.tid}`, e.args?.name ?? "");
  const complete = events.filter((e) => e.ph === "X" && e.dur !== undefined);
  const threadOf = (e: TraceEvent) => `${e.pid}:${e.tid}`;
  // The page's main thread: the renderer main thread with the most work.
  const perMain = new Map<string, number>();
  for (const e of complete) if (threadName.get(threadOf(e)) === "CrRendererMain") perMain.set(threadOf(e), (perMain.get(threadOf(e)) ?? 0) + 1);
  const mainKey = [...perMain.entries()].sort((a, b) => b[1] - a[1])[0]?.[0];
  const mainPid = mainKey?.split(":")[0];
  // Self time by name: an event's duration less the events nested in it (per thread).
  const selfTimes = (list: TraceEvent[]) => {
    const self = new Map<string, number>();
    const stack: Array<{ end: number; name: string }> = [];
    for (const e of [...list].sort((a, b) => a.ts - b.ts || b.dur! - a.dur!)) {
      while (stack.length && stack.at(-1)!.end <= e.ts) stack.pop();
      const parent = stack.at(-1);
      const end = Math.min(e.ts + e.dur!, parent?.end ?? Number.POSITIVE_INFINITY);
      const mine = (end - e.ts) / 1000;
      if (parent) self.set(parent.name, (self.get(parent.name) ?? 0) - mine);
      self.set(e.name, (self.get(e.name) ?? 0) + mine);
      stack.push({ end, name: e.name });
    }
    return self;
  };
  const main = selfTimes(complete.filter((e) => threadOf(e) === mainKey));
  // The renderer's other threads (compositor, raster workers), each thread's work counted once.
  let others = 0;
  const otherThreads = new Set(complete.filter((e) => String(e.pid) === mainPid && threadOf(e) !== mainKey).map(threadOf));
  for (const t of otherThreads) for (const v of selfTimes(complete.filter((e) => threadOf(e) === t)).values()) others += v;
  return { main, others, wall };
}

function traceLine(t: { main: Map<string, number>; others: number }, per: number, unit: string): string {
  const top = [...t.main.entries()]
    .filter(([, v]) => v / per >= 0.5)
    .sort((a, b) => b[1] - a[1])
    .slice(0, 8)
    .map(([name, v]) => `${name} ${(v / per).toFixed(1)}`)
    .join(", ");
  const total = [...t.main.values()].reduce((a, b) => a + b, 0);
  return `main thread ${(total / per).toFixed(1)} ms per ${unit} [${top}]; the renderer's other threads (compositor, raster) ${(t.others / per).toFixed(1)} ms per ${unit}`;
}

interface CommitFigures {
  enter: number;
  requestStart: number;
  responseEnd: number;
  painted: number;
  serverWait: number;
  changed: boolean;
  frames: FrameRecord[];
  keys: KeyRecord[];
  events: EventRecord[];
}

/**
 * Types `value` into the demand cell of `loadId` (not measured), then commits it with Enter and —
 * when `typeAfter` — types TYPED at once into the cell Enter moved focus to. Waits for the fresh
 * results and returns the timeline.
 */
async function commitAndMaybeType(page: Page, loadId: string, value: string, typeAfter: boolean, wrap: Wrap = plain): Promise<CommitFigures> {
  const cell = demandCell(page, loadId);
  await cell.focus();
  await page.keyboard.press("Control+A");
  await page.keyboard.type(value);
  await settle(page);
  const before = await resultRow(page, loadId);
  await page.evaluate(() => {
    performance.clearResourceTimings();
    window.__bench.frames = [];
    window.__bench.startWatch();
  });
  await probe(page, true);
  await wrap(async () => {
    await page.keyboard.press("Enter");
    if (typeAfter) await typeTimed(page, TYPED, TYPED.length);
    await page.waitForFunction(() => window.__bench.watch?.painted != null, undefined, { timeout: 60_000 });
  });
  await settle(page, 150);
  await probe(page, false);
  const { keys, frames, events, watch } = await harness(page);
  const solves = await solveTimings(page);
  if (typeAfter) await page.keyboard.press("Escape"); // the typed text was only for timing: revert it
  const after = await resultRow(page, loadId);
  const enterKey = keys.find((k) => k.key === "Enter");
  const solve = solves.at(-1);
  if (!enterKey || !solve || !watch?.painted) throw new Error(`commit of ${loadId}: the Enter key, the solve or the fresh results were not seen`);
  if (solves.length !== 1) console.log(`    (note: ${solves.length} solve requests for one commit)`);
  return {
    enter: enterKey.down,
    requestStart: solve.start,
    responseEnd: solve.end,
    painted: watch.painted,
    serverWait: solve.responseStart - solve.requestStart,
    changed: before !== after,
    frames,
    keys: keys.filter((k) => k.key !== "Enter"),
    events,
  };
}

async function main() {
  // The built client and Chromium's profile live here; removed at the end, whatever happens.
  const tmp = mkdtempSync(path.join(os.tmpdir(), "runwright-bench-editor-"));
  try {
    await run(tmp);
  } finally {
    rmSync(tmp, { recursive: true, force: true, maxRetries: 20, retryDelay: 100 });
  }
}

async function run(tmp: string) {
  const clientDir = path.join(tmp, "client");
  const buildStarted = performance.now();
  await buildClient(clientDir);
  const buildMs = performance.now() - buildStarted;

  const app = await startBenchApp(BENCH_DB, clientDir);
  const { base, call } = app;

  let context: BrowserContext | undefined;
  try {
    await call("POST", "/api/auth/sign-up", { companyName: "Bench Co", name: "Bench", email: EMAIL, password: PASSWORD });
    const client = await call("POST", "/api/clients", { name: "Bench client" });
    const job = await call("POST", "/api/jobs", { clientId: client.id, title: "Bench job" });
    const doc = network(25, 20);
    const system = await call("POST", `/api/jobs/${job.id}/systems`, { name: `Bench ${doc.loads.length}`, document: doc });
    const systemUrl = `${base}/jobs/${String(job.id)}/systems/${String(system.id)}`;

    context = await chromium.launchPersistentContext(path.join(tmp, "profile"), {
      executablePath: CHROMIUM_PATH,
      headless: true,
      args: CHROMIUM_ARGS,
      viewport: { width: 1280, height: 800 },
    });
    // tsx compiles with keepNames, which wraps inner functions in __name(); the functions sent to the
    // page are serialised as they are, so the page gets a no-op __name first.
    await context.addInitScript({ content: "globalThis.__name = globalThis.__name || ((f) => f);" });
    await context.addInitScript(installHarness, doc.loads.length);
    const page = await context.newPage();
    page.setDefaultTimeout(30_000);
    const pageErrors: string[] = [];
    page.on("pageerror", (error) => pageErrors.push(error.message));
    page.on("console", (msg) => msg.type() === "error" && pageErrors.push(msg.text()));
    const cdp = await context.newCDPSession(page);
    const version = (await cdp.send("Browser.getVersion")) as { product: string };
    await cdp.detach();

    await page.goto(`${base}/sign-in`);
    await page.getByLabel("E-mail").fill(EMAIL);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();

    const cpus = os.cpus();
    console.log(`System editor responsiveness, ${doc.loads.length} loads, ${doc.runs.length} runs, ${doc.points.length} points, 2 cases`);
    console.log(`  browser: ${version.product} (headless, ${CHROMIUM_PATH}, 1280×800), playwright-core, node ${process.version}`);
    console.log(`  machine: ${cpus.length} × ${cpus[0]?.model ?? "CPU"}; client, server and database share it (the server runs in this process)`);
    console.log(`  client built with vite in ${(buildMs / 1000).toFixed(1)} s; served by createApp at ${base}`);
    console.log("");

    // 1. Opening the system: navigation start → first frame with the solved results.
    console.log(`1. Opening /jobs/:jobId/systems/:systemId — navigation start to the first frame showing the solved results of all ${doc.loads.length} loads (the table's first 50 rows, no "Updating…"):`);
    const opens: number[] = [];
    for (let i = 0; i < ROUNDS; i++) {
      if (i === 0) await page.goto(systemUrl, { waitUntil: "commit" });
      else await page.reload({ waitUntil: "commit" });
      await page.waitForFunction(() => window.__bench.opened?.painted !== undefined, undefined, { timeout: 60_000 });
      await settle(page, 300); // the last long-animation-frame entries arrive a little after their frame
      const t = await page.evaluate(() => {
        const nav = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming;
        const res = performance.getEntriesByType("resource") as PerformanceResourceTiming[];
        const api = (re: RegExp) => res.find((r) => re.test(new URL(r.name).pathname));
        const system = api(/^\/api\/systems\/[^/]+$/);
        const solve = api(/\/solve$/);
        const scripts = res.filter((r) => r.initiatorType === "script" || /\.js$/.test(r.name));
        return {
          opened: window.__bench.opened!.painted!,
          html: nav.responseEnd,
          dcl: nav.domContentLoadedEventEnd,
          scriptEnd: Math.max(0, ...scripts.map((s) => s.responseEnd)),
          systemStart: system?.startTime,
          systemEnd: system?.responseEnd,
          solveStart: solve?.startTime,
          solveEnd: solve?.responseEnd,
          frames: window.__bench.frames,
        };
      });
      opens.push(t.opened);
      console.log(
        `   ${i === 0 ? "first open " : `reload ${i}   `}  ${ms(t.opened).padStart(9)}   (HTML ${ms(t.html)}, scripts loaded ${ms(t.scriptEnd)}, DOMContentLoaded ${ms(t.dcl)}, ` +
          `GET system ${ms(t.systemStart)}→${ms(t.systemEnd)}, POST solve ${ms(t.solveStart)}→${ms(t.solveEnd)}, ` +
          `then ${ms(t.opened - (t.solveEnd ?? Number.NaN))} to draw the results)`,
      );
      if (i === ROUNDS - 1) for (const line of frameSummary(t.frames, 0, t.opened)) console.log(`      ${line}`);
    }
    console.log(`   median ${ms(median(opens))}`);
    console.log("");

    // Entry tables → Loads.
    await page.getByRole("tablist", { name: "Entry tables" }).getByRole("tab", { name: "Loads", exact: true }).click();
    await demandCell(page, "l0-1").waitFor();
    await settle(page);

    // 2. Typing in a cell with nothing else going on.
    console.log(`2. Typing in a cell, idle editor — each of ${TYPED.length} digits typed ${KEY_GAP_MS} ms apart, ${ROUNDS} rounds; keydown (event.timeStamp) → the frame after the value changed has painted:`);
    const { keys: idle, events: idleEvents, frames: idleFrames } = await idleTyping(page, ["l0-1", "l0-2", "l0-4"]);
    console.log(`   keydown → painted:            ${spread(idle.map(latency))}`);
    console.log(`   keydown → next frame (rAF):   ${spread(idle.map((k) => (k.frame ?? Number.NaN) - k.down))}`);
    console.log(`   waiting before handling:      ${spread(idle.map(queued))}`);
    console.log(`   ${eventTimingLine(idleEvents, idle.length)}`);
    console.log(`   long animation frames (≥ 50 ms) while typing: ${idleFrames.length}${idleFrames.length ? `, median ${ms(median(idleFrames.map((f) => f.duration)))}` : ""}`);
    let idleTrace: Awaited<ReturnType<typeof traced>> | undefined;
    await idleTyping(page, ["l0-13"], async (act) => void (idleTrace = await traced(page, act)));
    console.log(`   one more round traced (Chrome trace, self time by event, ms per key): ${traceLine(idleTrace!, TYPED.length, "key")}`);
    console.log("");

    // 3. Typing while a solve is in flight; 4. commit → fresh results.
    console.log(`3. Typing while a solve is in flight — Enter commits a load's demand, then ${TYPED.length} digits go at once (${KEY_GAP_MS} ms apart) into the cell below; ${SOLVE_ROUNDS} rounds.`);
    console.log(`   Each key is put in the phase its keydown fell in: debounce (Enter → request sent), in flight (sent → answer received), answer being drawn (received → fresh results painted), after.`);
    const phases: Record<string, number[]> = { debounce: [], "in flight": [], "answer being drawn": [], after: [] };
    const queuedInFlight: number[] = [];
    const typedCommits: CommitFigures[] = [];
    for (const [round, loadId] of ["l0-3", "l0-6", "l0-9", "l0-3", "l0-6"].slice(0, SOLVE_ROUNDS).entries()) {
      const c = await commitAndMaybeType(page, loadId, `${7 + round}.5`, true);
      typedCommits.push(c);
      for (const k of c.keys) {
        const phase = k.down < c.requestStart ? "debounce" : k.down < c.responseEnd ? "in flight" : k.down < c.painted ? "answer being drawn" : "after";
        phases[phase].push(latency(k));
        if (phase === "in flight") queuedInFlight.push(queued(k));
      }
      const cells = [...new Set(c.keys.map((k) => k.cell))].join(", ");
      const roundTrip = c.responseEnd - c.requestStart;
      console.log(
        `   round ${round + 1}: committed ${loadId}, typed into "${cells}"; solve sent +${(c.requestStart - c.enter).toFixed(0)} ms, round trip ${ms(roundTrip)} ` +
          `(server ${ms(c.serverWait)} to first byte), results fresh +${(c.painted - c.enter).toFixed(0)} ms; keys: ` +
          c.keys.map((k) => latency(k).toFixed(0)).join(" ") +
          " ms",
      );
      for (const line of frameSummary(c.frames, c.enter, c.painted + 50)) console.log(`      ${line}`);
    }
    const all = typedCommits.flatMap((c) => c.keys.map(latency));
    console.log(`   all keys, keydown → painted:  ${spread(all)}`);
    for (const [phase, values] of Object.entries(phases)) console.log(`     ${(phase + ":").padEnd(22)} ${spread(values)}`);
    console.log(`   keys typed while the solve was in flight, waiting before handling: ${spread(queuedInFlight)}`);
    // The typed keys' own events (not the Enter that committed, nor its keyup).
    const typedEvents = typedCommits.flatMap((c) => c.events.filter((e) => c.keys.length > 0 && e.start >= c.keys[0].down - 1));
    console.log(`   ${eventTimingLine(typedEvents, all.length)}`);
    console.log("");

    const quietLoads = ["l0-5", "l0-7", "l0-8", "l0-10", "l0-11"];
    console.log(`4. Commit → fresh results — Enter on a load's demand (nothing typed after) to the first painted frame without "Updating…", ${quietLoads.length} commits:`);
    const quiet: CommitFigures[] = [];
    for (const [i, loadId] of quietLoads.entries()) quiet.push(await commitAndMaybeType(page, loadId, `${3 + i}.25`, false));
    const col = (f: (c: CommitFigures) => number) => spread(quiet.map(f)).replace(/ \(\d+ keys\)/, "");
    console.log(`   Enter → fresh results painted:          ${col((c) => c.painted - c.enter)}`);
    console.log(`     debounce (Enter → request sent):        ${col((c) => c.requestStart - c.enter)}   (SOLVE_DEBOUNCE_MS is 300)`);
    console.log(`     solve round trip (resource timing):     ${col((c) => c.responseEnd - c.requestStart)}   (server to first byte ${col((c) => c.serverWait)})`);
    console.log(`     answer → results painted (page work):   ${col((c) => c.painted - c.responseEnd)}`);
    console.log(`   the edited load's row in the results changed: ${quiet.every((c) => c.changed) && typedCommits.every((c) => c.changed) ? "yes, every commit" : "NOT every commit"}`);
    const last = quiet.at(-1)!;
    for (const line of frameSummary(last.frames, last.enter, last.painted + 50)) console.log(`      last commit: ${line}`);
    console.log("");

    // Where the time goes: the same typing and commits with the diagram's box not laid out (CSS),
    // with the results on their Findings tab (no 500-row table in the page), and with both.
    console.log("Diagnostics (where the page's time goes; the editor code is unchanged, only what is shown):");
    let edit = 0;
    const resultsTab = async (name: RegExp) => {
      await page.getByRole("tablist", { name: "Results" }).getByRole("tab", { name }).click();
      await settle(page);
    };
    const diag = async (label: string) => {
      const typing = await idleTyping(page, ["l0-16"]);
      const runs: CommitFigures[] = [];
      for (const loadId of ["l0-12", "l0-13", "l0-14"]) runs.push(await commitAndMaybeType(page, loadId, `${4 + ++edit}.75`, false));
      const commitScript = runs.map((c) => c.frames.filter((f) => f.start >= c.enter - 5 && f.start < c.requestStart).reduce((a, f) => a + f.duration, 0));
      const work = runs.map((c) => c.painted - c.responseEnd);
      console.log(`   ${label}`);
      console.log(`      idle key, keydown → painted ${spread(typing.keys.map(latency))}`);
      console.log(`      commit: long frames before the solve is sent, median ${ms(median(commitScript))}; answer → results painted, median ${ms(median(work))}`);
    };
    await diag("as shown (diagram, results on their Loads tab with 500 rows):");
    const hide = await page.addStyleTag({ content: 'section[aria-labelledby="one-line-heading"] { display: none !important; }' });
    await settle(page);
    await diag("diagram hidden with CSS (React still renders it):");
    await resultsTab(/^Findings/);
    await diag("diagram hidden and results on the Findings tab:");
    await hide.evaluate((el) => (el as HTMLElement).remove());
    await settle(page);
    await diag("diagram shown, results on the Findings tab (no 500-row table):");
    await resultsTab(/^Loads$/);

    // Focus moving to a cell in another row selects that load: the editor re-renders with the new selection.
    const focusTrace = await traced(page, async () => {
      for (const loadId of ["l0-17", "l0-18", "l0-19"]) {
        await demandCell(page, loadId).focus();
        await settle(page, 150);
      }
    });
    console.log(`   focusing a cell in another row (selects that load), traced: ${traceLine(focusTrace, 3, "focus")}`);
    let commitTrace: Awaited<ReturnType<typeof traced>> | undefined;
    await commitAndMaybeType(page, "l0-15", "9.125", false, async (act) => void (commitTrace = await traced(page, act)));
    console.log(`   one commit, Enter → fresh results painted, traced: ${traceLine(commitTrace!, 1, "commit")}`);
    if (pageErrors.length) console.log(`   page errors: ${pageErrors.join(" | ")}`);
    console.log("");
    console.log("Target (issue 5): with 500 loads, typing in a cell never waits for a solve — the keys typed while the solve is in flight (3) should be as quick as idle typing (2).");
  } finally {
    if (context) await context.close();
    await app.close();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
