import path from "node:path";

/** The repository's top folder (this file sits in server/scripts/). */
export const projectRoot = path.resolve(import.meta.dirname, "..", "..");
