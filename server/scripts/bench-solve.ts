// npm run bench:solve: the System editor's solve round trip, measured — a benchmark, not a test. It
// prints figures and never fails on a missed target (exit code 0 unless the script itself breaks).
//
// What it does: opens the development cluster (as `npm start` does; its own database
// "runwright_bench", dropped and made afresh), migrates it, serves the real app (createApp, sessions
// in PostgreSQL) on 127.0.0.1, signs up a company over HTTP, creates a job and a system, then POSTs
// /api/systems/:id/solve with a generated 200-load network (what the editor sends after an edit) and
// times each request from fetch() to the parsed JSON answer: 20 warm-up requests, then 200 timed ones,
// one at a time. Client and server share this process (and its one event loop), so the figure
// includes both sides' JSON work. Target (issue 5): a round trip under 150 ms for 200 loads.
// Also times the same with 500 loads, and a save (PUT with the version, which solves too).
import { performance } from "node:perf_hooks";
import { network, startBenchApp } from "./bench-support.js";

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
const ms = (v: number) => `${v.toFixed(1)} ms`;

async function main() {
  const app = await startBenchApp("runwright_bench");
  const { base, call } = app;
  try {
    await call("POST", "/api/auth/sign-up", { companyName: "Bench Co", name: "Bench", email: "bench@bench.test", password: "bench-password-2026" });
    const client = await call("POST", "/api/clients", { name: "Bench client" });
    const job = await call("POST", "/api/jobs", { clientId: client.id, title: "Bench job" });
    console.log(`solve round trip, POST /api/systems/:id/solve on ${base} (node ${process.version})`);
    for (const [panels, perPanel] of [[10, 20], [25, 20]] as const) {
      const doc = network(panels, perPanel);
      const system = await call("POST", `/api/jobs/${job.id}/systems`, { name: `Bench ${doc.loads.length}`, document: doc });
      const bytes = JSON.stringify({ document: doc }).length;
      for (let i = 0; i < 20; i++) await call("POST", `/api/systems/${system.id}/solve`, { document: doc });
      const times: number[] = [];
      let answer: Record<string, unknown> = {};
      for (let i = 0; i < 200; i++) {
        // A different load each time, as an estimator's edits would be.
        const edited = structuredClone(doc);
        const load = edited.loads[i % edited.loads.length] as { amps?: number; watts?: number };
        if (load.amps !== undefined) load.amps += 0.01;
        else load.watts = (load.watts ?? 10) + 0.1;
        const started = performance.now();
        answer = await call("POST", `/api/systems/${system.id}/solve`, { document: edited });
        times.push(performance.now() - started);
      }
      times.sort((a, b) => a - b);
      const mean = times.reduce((a, b) => a + b, 0) / times.length;
      const loads = (answer.loads as unknown[]).length;
      console.log(
        `  ${String(doc.loads.length).padStart(4)} loads, ${doc.runs.length} runs, ${(bytes / 1024).toFixed(0)} KB posted, ok=${String(answer.ok)}, ${loads} load results: ` +
          `p50 ${ms(percentile(times, 50))}, p95 ${ms(percentile(times, 95))}, max ${ms(times.at(-1)!)}, mean ${ms(mean)} (200 requests)`,
      );
      const saves: number[] = [];
      let version = system.version as number;
      for (let i = 0; i < 30; i++) {
        const started = performance.now();
        const saved = await call("PUT", `/api/systems/${system.id}`, { version, document: doc });
        saves.push(performance.now() - started);
        version = saved.version as number;
      }
      saves.sort((a, b) => a - b);
      console.log(`        save (PUT with the version; validates, solves for the summary, writes): p50 ${ms(percentile(saves, 50))}, p95 ${ms(percentile(saves, 95))} (30 requests)`);
    }
    console.log("target: a 200-load solve round trip under 150 ms");
  } finally {
    await app.close();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
