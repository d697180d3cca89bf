import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { EventHub } from "./events.js";
import { createStripeFakeApp } from "./server.js";
import { Store } from "./store.js";

// A small Stripe-compatible server for development and tests: Checkout Sessions, PaymentIntents and refunds
// under /v1 for the official SDK, a test payment page under /pay, signed webhook delivery, and a JSON
// control API under /_fake. In memory only; every secret key is its own account.

export interface StripeFake {
  /** e.g. http://127.0.0.1:41234 (no trailing slash). */
  url: string;
  port: number;
  /** Stops listening, drops pending webhook retries and aborts deliveries in flight. */
  stop(): Promise<void>;
}

export interface StripeFakeOptions {
  /** 0 or absent: any free port. */
  port?: number;
  /** Default 127.0.0.1. */
  host?: string;
  /** Waits before each retry of a failed webhook delivery (ms); default [1000, 5000, 15000]. */
  retryDelaysMs?: number[];
}

export const DEFAULT_RETRY_DELAYS_MS: readonly number[] = [1000, 5000, 15000];

export async function startStripeFake(options: StripeFakeOptions = {}): Promise<StripeFake> {
  const host = options.host ?? "127.0.0.1";
  const store = new Store();
  const hub = new EventHub([...(options.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS)]);
  let url = "";
  const app = createStripeFakeApp(store, hub, () => url);
  const server = await listen(createServer(app), host, options.port ?? 0);
  const port = (server.address() as AddressInfo).port;
  url = `http://${linkHost(host)}:${port}`;

  let stopping: Promise<void> | undefined;
  return {
    url,
    port,
    stop() {
      stopping ??= new Promise<void>((resolve, reject) => {
        hub.stop();
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeAllConnections();
      });
      return stopping;
    },
  };
}

function listen(server: Server, host: string, port: number): Promise<Server> {
  return new Promise((resolve, reject) => {
    server.once("error", (error: NodeJS.ErrnoException) => {
      reject(error.code === "EADDRINUSE" ? new Error(`Stripe stand-in: port ${port} on ${host} is already in use.`) : error);
    });
    server.listen(port, host, () => resolve(server));
  });
}

/** The host to put in links: a wildcard address is not something a browser can open. */
function linkHost(host: string): string {
  if (host === "0.0.0.0" || host === "") return "127.0.0.1";
  if (host === "::") return "[::1]";
  return host.includes(":") ? `[${host}]` : host;
}
