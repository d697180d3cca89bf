import express from "express";
import net from "node:net";
import { describe, expect, it } from "vitest";
import { readEnv } from "../../server/config/env.js";
import { closeServer, listen, PortInUseError } from "../../server/http-server.js";
import { findFreePort } from "../../server/scripts/port-check.js";

describe("listen", () => {
  it("gives a one-line error naming the port and PORT when the port is taken", async () => {
    const port = await findFreePort();
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(port, "127.0.0.1", resolve));
    try {
      const failure = await listen(express(), "127.0.0.1", port).then(() => undefined, (error: unknown) => error);
      expect(failure).toBeInstanceOf(PortInUseError);
      expect((failure as Error).message).toBe(
        `Port ${port} on 127.0.0.1 is already in use (is Runwright already running?); set PORT to another port.`,
      );
      expect((failure as Error).message).not.toContain("\n");
    } finally {
      await new Promise((resolve) => blocker.close(resolve));
    }
  });

  it("finishes an in-flight request before closing", async () => {
    const app = express();
    app.get("/slow", (_req, res) => void setTimeout(() => res.send("done"), 300));
    const port = await findFreePort();
    const server = await listen(app, "127.0.0.1", port);
    const pending = fetch(`http://127.0.0.1:${port}/slow`).then((r) => r.text());
    await new Promise((resolve) => setTimeout(resolve, 50));
    await closeServer(server, 5000);
    expect(await pending).toBe("done");
  });
});

describe("readEnv", () => {
  it("applies the documented defaults", () => {
    const env = readEnv({});
    expect(env).toMatchObject({ HOST: "127.0.0.1", PORT: 3000, RUNWRIGHT_DB_PORT: 5544, RUNWRIGHT_DATA_DIR: ".data" });
  });

  it("treats an empty variable as unset", () => {
    const env = readEnv({ PORT: "", DATABASE_URL: "" });
    expect(env.PORT).toBe(3000);
    expect(env.DATABASE_URL).toBeUndefined();
  });

  it("names the variable that is wrong", () => {
    expect(() => readEnv({ PORT: "eighty" })).toThrow(/^Invalid environment: PORT: /);
    expect(() => readEnv({ RUNWRIGHT_DB_PORT: "70000" })).toThrow(/RUNWRIGHT_DB_PORT/);
  });
});
