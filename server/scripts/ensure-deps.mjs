// Plain JavaScript on purpose: this runs before any dependency is installed.
import { spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..", "..");

/** Runs `npm ci` when node_modules is missing, was never completed, or is older than package-lock.json (after a pull). */
export function ensureDependencies() {
  const installed = path.join(root, "node_modules", ".package-lock.json");
  if (existsSync(installed) && statSync(installed).mtimeMs >= statSync(path.join(root, "package-lock.json")).mtimeMs) return;
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
