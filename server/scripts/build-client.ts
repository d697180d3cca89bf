import path from "node:path";
import { build } from "vite";
import { projectRoot } from "./project-root.js";

/** Builds the React client into outDir with the project's vite.config.ts. */
export async function buildClient(outDir: string): Promise<void> {
  await build({
    configFile: path.join(projectRoot, "vite.config.ts"),
    root: projectRoot,
    logLevel: "warn",
    build: { outDir, emptyOutDir: true },
  });
}
