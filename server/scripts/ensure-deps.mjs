// Plain JavaScript on purpose: this runs before any dependency is installed.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..", "..");

/** Runs `npm ci` when node_modules is missing or was never completed. */
export function ensureDependencies() {
  if (existsSync(path.join(root, "node_modules", ".package-lock.json"))) return;
  console.log("Installing dependencies (npm ci)…");
  const npm = process.platform === "win32" ? "npm.cmd" : "npm";
  const result = spawnSync(npm, ["ci", "--no-audit", "--no-fund"], { cwd: root, stdio: "inherit" });
  if (result.status !== 0) {
    console.error("runwright: npm ci failed; fix the error above and run the command again.");
    process.exit(1);
  }
}

/** Installs dependencies if needed, then loads a TypeScript module through tsx in this same process. */
export async function runTypeScript(modulePath) {
  ensureDependencies();
  const { register } = await import("tsx/esm/api");
  register();
  await import(modulePath);
}
