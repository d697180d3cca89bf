// npm run bench:pdf: a benchmark of the PDF renderers, not a test. It prints figures and never
// fails on a missed target (the exit code is 0 unless the script itself breaks).
//
// For a quote of 100 priced lines (tests/support/quote-snapshot.ts largeSnapshot(100): two
// systems, six loads, nine runs) it renders the quote and then the cut list 3 times to warm up
// (module loading, the font files, the JIT), then 30 times each, and prints p50 / p95 / max
// wall time in ms, the median CPU time of this process per render (user + system, which other
// load on the machine disturbs less than wall time, though garbage collection threads add to
// it), the size of the file and its pages. The target is under 300 ms for the quote.
// Figures are for the machine it runs on; compare them only with figures from the same machine.
import { performance } from "node:perf_hooks";
import { renderCutListPdf } from "../pdf/cut-list-pdf.js";
import { renderQuotePdf } from "../pdf/quote-pdf.js";
import { largeSnapshot } from "../../tests/support/quote-snapshot.js";

const WARM_UP = 3;
const RUNS = 30;
const LINES = 100;
const TARGET_MS = 300;

/** The value at quantile q of sorted figures (nearest rank). */
function quantile(sorted: readonly number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
}

/** Pages of a pdfkit file: its page tree's /Count (pdfkit writes one, uncompressed). */
function pageCount(pdf: Buffer): number {
  const m = /\/Type \/Pages\s*\/Count (\d+)/.exec(pdf.toString("latin1"));
  return m ? Number(m[1]) : NaN;
}

async function measure(name: string, render: () => Promise<Buffer>): Promise<void> {
  const first = performance.now();
  let bytes = await render();
  for (let i = 1; i < WARM_UP; i++) bytes = await render();
  const warmUp = performance.now() - first;
  const times: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    const c = process.cpuUsage();
    bytes = await render();
    const used = process.cpuUsage(c);
    times.push(performance.now() - t);
    cpu.push((used.user + used.system) / 1000);
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  const f = (ms: number) => ms.toFixed(1).padStart(7);
  console.log(
    `${name.padEnd(20)} p50 ${f(quantile(times, 0.5))} ms   p95 ${f(quantile(times, 0.95))} ms   max ${f(times[times.length - 1])} ms   cpu p50 ${f(quantile(cpu, 0.5))} ms   ` +
      `${(bytes.length / 1024).toFixed(1)} KiB, ${pageCount(bytes)} pages   (${WARM_UP} warm-up runs: ${warmUp.toFixed(0)} ms)`,
  );
}

const snapshot = largeSnapshot(LINES);
const label = "Q-2026-0042 R2";
console.log(`PDF renderers, ${RUNS} runs after ${WARM_UP} warm-up runs; ${LINES} priced lines, target for the quote < ${TARGET_MS} ms (Node ${process.version})`);
await measure(`quote, ${LINES} lines`, () => renderQuotePdf(snapshot, { label, acceptUrl: "https://app.runwright.example/q/bench-token" }));
await measure("cut list, same job", () => renderCutListPdf(snapshot, { label }));
