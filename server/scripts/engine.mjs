// npm run solve / npm run autosize: the engine's command line.
// Plain JavaScript on purpose: it bundles server/scripts/engine-cli.ts and the engine with
// esbuild into node_modules/.cache/runwright/ (rebuilt when a source is newer) and runs the
// bundle with plain node. Loading through tsx instead costs about 0.3 s of compile time on
// every run, more than a whole solve of 20,000 fixtures.
import { existsSync, mkdirSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { ensureDependencies } from "./ensure-deps.mjs";

const root = path.resolve(import.meta.dirname, "..", "..");
const entry = path.join(root, "server", "scripts", "engine-cli.ts");
const outDir = path.join(root, "node_modules", ".cache", "runwright");
const outFile = path.join(outDir, "engine-cli.mjs");

function newestSource() {
  let newest = statSync(entry).mtimeMs;
  const dir = path.join(root, "shared", "engine");
  for (const name of readdirSync(dir)) newest = Math.max(newest, statSync(path.join(dir, name)).mtimeMs);
  return newest;
}

ensureDependencies();
if (!existsSync(outFile) || statSync(outFile).mtimeMs < newestSource()) {
  mkdirSync(outDir, { recursive: true });
  const { build } = await import("esbuild");
  await build({
    entryPoints: [entry],
    outfile: outFile,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    // Loaded from node_modules at run time; mathjs only when a length is typed with a unit.
    external: ["zod", "mathjs"],
    logLevel: "error",
  });
}
const { main } = await import(pathToFileURL(outFile).href);
process.exitCode = await main(process.argv.slice(2));
