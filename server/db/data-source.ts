import "reflect-metadata";
import { DataSource } from "typeorm";
import { entities } from "./entities/index.js";
import { migrations } from "./migrations/index.js";

export interface DataSourceOptions {
  url: string;
  /** How long a query waits for a pooled connection before failing (ms). */
  connectTimeoutMs?: number;
  logging?: boolean;
}

/** The one DataSource of the app. `synchronize` is never on: the schema comes from migrations only. */
export function createDataSource({ url, connectTimeoutMs = 5000, logging = false }: DataSourceOptions): DataSource {
  return new DataSource({
    type: "postgres",
    url,
    entities,
    migrations,
    migrationsTableName: "typeorm_migrations",
    synchronize: false,
    migrationsRun: false,
    uuidExtension: "pgcrypto",
    logging,
    extra: { connectionTimeoutMillis: connectTimeoutMs, max: 10 },
  });
}
