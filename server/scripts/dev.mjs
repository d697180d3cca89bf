// npm run dev: the API on PORT and Vite's dev server with HMR, proxying /api to it.
import { runTypeScript } from "./ensure-deps.mjs";

await runTypeScript("./dev-app.ts");
