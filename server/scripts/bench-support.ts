// What bench:solve and bench:editor share: the generated network, and a fresh database in the
// development cluster with the real app serving it on 127.0.0.1 and an HTTP caller that keeps the
// session cookie.
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { DataSource } from "typeorm";
import { SYSTEM_FORMAT, type SystemInput } from "../../shared/engine/schema.js";
import { CSRF_HEADER } from "../../shared/http.js";
import { createApp } from "../app.js";
import { readEnv } from "../config/env.js";
import { createDataSource } from "../db/data-source.js";
import { openDevDatabase } from "./dev-database.js";

export interface BenchApp {
  base: string;
  db: DataSource;
  server: Server;
  /** An API call with the session cookie and the CSRF header; throws on a non-2xx answer. */
  call(method: string, path: string, body?: unknown): Promise<Record<string, unknown>>;
  /** Stops the server, drops the database (unless `keep`) and says the cluster keeps running. */
  close(options?: { keep?: boolean }): Promise<void>;
}

/** Makes `database` afresh in the development cluster, migrates it and serves the app on a free port. */
export async function startBenchApp(database: string, clientDir?: string): Promise<BenchApp> {
  const { url, cluster } = await openDevDatabase(readEnv());
  const admin = async (sql: string) => {
    const ds = createDataSource({ url });
    await ds.initialize();
    try {
      await ds.query(sql);
    } finally {
      await ds.destroy();
    }
  };
  await admin(`DROP DATABASE IF EXISTS ${database} WITH (FORCE)`);
  await admin(`CREATE DATABASE ${database}`);
  const db = createDataSource({ url: url.replace(/\/[^/]*$/, `/${database}`) });
  await db.initialize();
  await db.runMigrations({ transaction: "all" });
  const server = createServer(createApp({ db, clientDir }));
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  let cookie = "";
  const call = async (method: string, path: string, body?: unknown) => {
    const response = await fetch(`${base}${path}`, {
      method,
      headers: { "Content-Type": "application/json", [CSRF_HEADER]: "1", ...(cookie ? { Cookie: cookie } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const set = response.headers.get("set-cookie");
    if (set) cookie = set.split(";")[0];
    const json = (await response.json()) as Record<string, unknown>;
    if (!response.ok) throw new Error(`${method} ${path}: ${response.status} ${JSON.stringify(json).slice(0, 300)}`);
    return json;
  };
  const close = async ({ keep = false } = {}) => {
    server.closeAllConnections();
    await new Promise((resolve) => server.close(resolve));
    await db.destroy();
    if (!keep) await admin(`DROP DATABASE IF EXISTS ${database} WITH (FORCE)`);
    if (cluster) console.log("(the development cluster keeps running; `npm run db -- stop` stops it)");
  };
  return { base, db, server, call, close };
}

export function network(panels: number, perPanel: number): SystemInput {
  const doc: SystemInput = {
    format: SYSTEM_FORMAT,
    units: "metric",
    nominalVoltage: 24,
    points: [{ id: "bus", name: "Battery bus bar", fuseInterruptingA: 20000 }],
    sources: [{ id: "bank", type: "battery", point: "bus", voltage: 25.6, internalResistanceOhm: 0.004 }],
    runs: [],
    loads: [],
    cases: [
      { name: "Full charge", sourceVoltages: { bank: 27.2 }, conductorTemperatureC: 25 },
      { name: "Low battery, hot day", sourceVoltages: { bank: 24 }, conductorTemperatureC: 60 },
    ],
  };
  const models = ["constantCurrent", "constantResistance", "constantPower"] as const;
  for (let p = 0; p < panels; p++) {
    const panel = `panel${p}`;
    doc.points.push({ id: panel, name: `Distribution ${p}` });
    doc.runs.push({ id: `feed${p}`, from: "bus", to: panel, length: 5 + p, size: "25 mm2", kind: "feeder", fuseA: 80 });
    for (let i = 0; i < perPanel; i++) {
      const point = `p${p}-${i}`;
      doc.points.push({ id: point });
      doc.runs.push({ id: `r${p}-${i}`, from: panel, to: point, length: 3 + (i % 7) * 2, size: "2.5 mm2" });
      const model = models[(p + i) % 3];
      const load = `l${p}-${i}`;
      if (model === "constantCurrent") doc.loads.push({ id: load, point, model, amps: 0.5 + (i % 4) * 0.25 });
      else if (model === "constantResistance") doc.loads.push({ id: load, point, model, watts: 12 + (i % 5) * 3 });
      else doc.loads.push({ id: load, point, model, watts: 10 + (i % 6) * 2 });
    }
  }
  return doc;
}
