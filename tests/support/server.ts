import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Express } from "express";

/** Listens on an ephemeral 127.0.0.1 port; returns the base URL and a closer. */
export async function serveOnLoopback(app: Express): Promise<{ url: string; close: () => Promise<void> }> {
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, "127.0.0.1", () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    close: () =>
      new Promise((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
