import type { Server } from "node:http";
import { pino } from "pino";
import type { DataSource } from "typeorm";
import { createApp } from "./app.js";
import type { Env } from "./config/env.js";
import { createDataSource } from "./db/data-source.js";
import { seedDemo } from "./db/seed.js";
import { closeServer, listen } from "./http-server.js";

export interface StartOptions {
  env: Env;
  databaseUrl: string;
  clientDir?: string;
  /** Seed the demo company (npm start does; a production deployment would not). */
  seed?: boolean;
}

export interface RunningServer {
  server: Server;
  db: DataSource;
  url: string;
  /** Finishes in-flight requests, closes the pool. */
  stop(): Promise<void>;
}

/** Connects, migrates, seeds, builds the app and listens: the server's only side effects. */
export async function startServer({ env, databaseUrl, clientDir, seed = true }: StartOptions): Promise<RunningServer> {
  const logger = pino({ level: env.LOG_LEVEL });
  const db = createDataSource({ url: databaseUrl, connectTimeoutMs: env.DB_CONNECT_TIMEOUT_MS });
  await db.initialize();
  try {
    const ran = await db.runMigrations({ transaction: "all" });
    if (ran.length > 0) logger.info({ migrations: ran.map((m) => m.name) }, "migrations ran");
    if (seed) await seedDemo(db);
    const app = createApp({ db, clientDir, logger, dbTimeoutMs: env.DB_CONNECT_TIMEOUT_MS });
    const server = await listen(app, env.HOST, env.PORT);
    return {
      server,
      db,
      url: `http://${env.HOST}:${env.PORT}`,
      async stop() {
        await closeServer(server);
        await db.destroy();
      },
    };
  } catch (error) {
    await db.destroy();
    throw error;
  }
}
