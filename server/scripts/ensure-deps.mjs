// Plain JavaScript on purpose: this runs before any dependency is installed.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..", "..");

const marker = path.join(root, "node_modules", ".cache", "runwright", "installed-lock.sha256");

function lockHash() {
  return createHash("sha256").update(readFileSync(path.join(root, "package-lock.json"))).digest("hex");
}

/**
 * Runs `npm ci` when node_modules is missing or was never completed, or when
 * package-lock.json changed since this script last installed (after a pull).
 * An install made by hand or by CI is trusted and marked.
 */
export function ensureDependencies() {
  const installed = existsSync(path.join(root, "node_modules", ".package-lock.json"));
  const hash = lockHash();
  if (installed && !existsSync(marker)) return writeMarker(hash);
  if (installed && readFileSync(marker, "utf8").trim() === hash) return;
  console.log("Installing dependencies (npm ci)…");
  const npm = process.platform === "win32" ? "npm.cmd" : "npm";
  const result = spawnSync(npm, ["ci", "--no-audit", "--no-fund"], { cwd: root, stdio: "inherit" });
  if (result.status !== 0) {
    console.error("runwright: npm ci failed; fix the error above and run the command again.");
    process.exit(1);
  }
  writeMarker(hash);
}

function writeMarker(hash) {
  mkdirSync(path.dirname(marker), { recursive: true });
  writeFileSync(marker, `${hash}\n`);
}

/** Installs dependencies if needed, then loads a TypeScript module through tsx in this same process. */
export async function runTypeScript(modulePath) {
  ensureDependencies();
  const { register } = await import("tsx/esm/api");
  register();
  await import(modulePath);
}
