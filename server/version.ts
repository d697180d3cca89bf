import { readFileSync } from "node:fs";
import path from "node:path";

/** The version in package.json, reported by /api/health. */
export const APP_VERSION: string = JSON.parse(
  readFileSync(path.resolve(import.meta.dirname, "..", "package.json"), "utf8"),
).version;
