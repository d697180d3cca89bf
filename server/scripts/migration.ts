// npm run migration -- run | revert | show | generate <verb-noun> | create <verb-noun>
// generate: diffs the entities against the development database (after running
// every migration) and writes server/db/migrations/<timestamp>-<verb-noun>.ts.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { readEnv } from "../config/env.js";
import { createDataSource } from "../db/data-source.js";
import { openDevDatabase } from "./dev-database.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError, StartupError } from "./startup-error.js";

async function main([command, name]: string[]): Promise<void> {
  const env = readEnv();
  const { url } = await openDevDatabase(env);
  const db = createDataSource({ url });
  await db.initialize();
  try {
    switch (command) {
      case "run": {
        const done = await db.runMigrations({ transaction: "all" });
        console.log(done.length ? `Ran ${done.map((m) => m.name).join(", ")}` : "No pending migrations.");
        return;
      }
      case "revert":
        await db.undoLastMigration({ transaction: "all" });
        console.log("Reverted the last migration.");
        return;
      case "show":
        console.log((await db.showMigrations()) ? "There are pending migrations." : "All migrations have run.");
        return;
      case "generate":
      case "create": {
        if (!name || !/^[a-z]+(-[a-z0-9]+)*$/.test(name)) {
          throw new StartupError(`usage: npm run migration -- ${command} <verb-noun> (kebab-case, e.g. add-company-logo)`);
        }
        if (command === "generate") await db.runMigrations({ transaction: "all" });
        await db.destroy();
        const target = path.join("server", "db", "migrations", name);
        const args = ["--import", "tsx", "node_modules/typeorm/cli.js", `migration:${command}`];
        if (command === "generate") args.push("-d", "server/db/cli-data-source.ts", "--pretty");
        args.push(target);
        const result = spawnSync(process.execPath, args, { cwd: projectRoot, stdio: "inherit", env: { ...process.env, DATABASE_URL: url } });
        process.exitCode = result.status ?? 1;
        return;
      }
      default:
        throw new StartupError("usage: npm run migration -- run | revert | show | generate <verb-noun> | create <verb-noun>");
    }
  } finally {
    if (db.isInitialized) await db.destroy();
  }
}

main(process.argv.slice(2)).catch(exitWithStartupError);
