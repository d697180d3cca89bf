// npm test: install what is missing, start a throwaway PostgreSQL, run vitest, stop it.
import { runTypeScript } from "./ensure-deps.mjs";

await runTypeScript("./run-tests.ts");
