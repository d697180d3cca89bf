// npm start: install what is missing, bring up PostgreSQL, migrate, seed, build, serve.
import { runTypeScript } from "./ensure-deps.mjs";

await runTypeScript("./start-app.ts");
