// Debian programs the test suite checks against: ngspice (the engine is compared with its
// simulations) and pdftotext from poppler-utils (the quote and cut list PDFs are read back as
// text). npm test installs what is missing with apt-get when we are root; anyone else gets the
// command to run.
import { spawnSync } from "node:child_process";
import { StartupError } from "./startup-error.js";

const TOOLS = [
  { command: "ngspice", pkg: "ngspice" },
  { command: "pdftotext", pkg: "poppler-utils" },
] as const;

const has = (command: string) => spawnSync("sh", ["-c", `command -v ${command}`], { encoding: "utf8" }).status === 0;

export function ensureTestTools(): void {
  const missing = TOOLS.filter((t) => !has(t.command)).map((t) => t.pkg);
  if (missing.length === 0) return;
  const command = `apt-get update && apt-get install -y --no-install-recommends ${missing.join(" ")}`;
  if (process.getuid?.() !== 0) {
    throw new StartupError(`${missing.join(" and ")} ${missing.length === 1 ? "is" : "are"} not installed (the tests use them); install with: sudo sh -c '${command}'`);
  }
  console.log(`${missing.join(" and ")} missing; running: ${command}`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const update = spawnSync("apt-get", ["update", "-q"], { stdio: "inherit", env });
  const install = update.status === 0 ? spawnSync("apt-get", ["install", "-y", "-q", "--no-install-recommends", ...missing], { stdio: "inherit", env }) : update;
  if (install.status !== 0 || TOOLS.some((t) => !has(t.command))) {
    throw new StartupError(`Installing ${missing.join(" and ")} failed; run this yourself and try again: ${command}`);
  }
}
