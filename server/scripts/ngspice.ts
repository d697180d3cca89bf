// The engine's tests compare it with ngspice, Debian's circuit simulator. npm test installs it
// with apt-get when it is missing and we are root; anyone else gets the command to run.
import { spawnSync } from "node:child_process";
import { StartupError } from "./startup-error.js";

export function hasNgspice(): boolean {
  return spawnSync("sh", ["-c", "command -v ngspice"], { encoding: "utf8" }).status === 0;
}

export function ensureNgspice(): void {
  if (hasNgspice()) return;
  const command = "apt-get update && apt-get install -y --no-install-recommends ngspice";
  if (process.getuid?.() !== 0) {
    throw new StartupError(`ngspice is not installed (the engine tests compare against it); install it with: sudo sh -c '${command}'`);
  }
  console.log(`ngspice is missing; running: ${command}`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const update = spawnSync("apt-get", ["update", "-q"], { stdio: "inherit", env });
  const install = update.status === 0
    ? spawnSync("apt-get", ["install", "-y", "-q", "--no-install-recommends", "ngspice"], { stdio: "inherit", env })
    : update;
  if (install.status !== 0 || !hasNgspice()) {
    throw new StartupError(`Installing ngspice failed; run this yourself and try again: ${command}`);
  }
}
