import { createServer, type Server } from "node:http";
import type { Express } from "express";

/**
 * Listens on host:port. A port already in use becomes a one-line message
 * naming the port and the variable that changes it.
 */
export function listen(app: Express, host: string, port: number, portVariable = "PORT"): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = createServer(app);
    server.once("error", (error: NodeJS.ErrnoException) => {
      if (error.code === "EADDRINUSE") {
        reject(new PortInUseError(`Port ${port} on ${host} is already in use (is Runwright already running?); set ${portVariable} to another port.`));
      } else if (error.code === "EACCES") {
        reject(new PortInUseError(`Port ${port} on ${host} needs more privileges; set ${portVariable} to a port above 1023.`));
      } else reject(error);
    });
    server.listen(port, host, () => resolve(server));
  });
}

export class PortInUseError extends Error {
  override name = "PortInUseError";
}

/** Stops accepting connections and waits for in-flight requests, at most graceMs. */
export function closeServer(server: Server, graceMs = 10000): Promise<void> {
  return new Promise((resolve) => {
    // Keep-alive connections that finish their request go idle; close them as they do.
    const sweep = setInterval(() => server.closeIdleConnections(), 50);
    const timer = setTimeout(() => {
      server.closeAllConnections();
    }, graceMs);
    server.close(() => {
      clearInterval(sweep);
      clearTimeout(timer);
      resolve();
    });
    server.closeIdleConnections();
  });
}
