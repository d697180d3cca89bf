// npm run db -- start | stop | status | url
// Manages the development cluster by hand (npm start does this by itself).
import { readEnv } from "../config/env.js";
import { devCluster, openDevDatabase } from "./dev-database.js";
import { exitWithStartupError } from "./startup-error.js";

async function main(command: string | undefined): Promise<void> {
  const env = readEnv();
  const cluster = devCluster(env);
  switch (command) {
    case "start": {
      const { url } = await openDevDatabase(env);
      console.log(`PostgreSQL is up: ${url}`);
      return;
    }
    case "stop":
      cluster.stop({ force: true });
      console.log("PostgreSQL stopped.");
      return;
    case "status": {
      const port = cluster.runningServerPort();
      console.log(port ? `PostgreSQL is running on 127.0.0.1:${port} (${cluster.dataDir})` : "PostgreSQL is not running.");
      return;
    }
    case "url":
      console.log(cluster.url("runwright"));
      return;
    default:
      console.error("usage: npm run db -- start | stop | status | url");
      process.exitCode = 2;
  }
}

main(process.argv[2]).catch(exitWithStartupError);
