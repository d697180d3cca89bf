// A loopback TCP relay in front of a real local service (PostgreSQL, the mail catcher) that a test
// opens, cuts (every connection dropped, new ones refused) or turns into a server that answers every
// connection with a refusal — a service going down and coming back, with nothing of ours faked.
import net from "node:net";

export interface Relay {
  readonly port: number;
  /** Forward every new connection to the target. */
  open(): Promise<void>;
  /** Drop every connection and refuse new ones (connection refused). */
  cut(): Promise<void>;
  /** Accept connections, write `greeting` and hang up, counting them (a service that is up but refuses). */
  refuse(greeting: string): Promise<void>;
  /** When each connection arrived (ms since the epoch), in any mode but cut. */
  readonly connections: number[];
}

export function tcpRelay(listenPort: number, targetPort: number): Relay {
  let server: net.Server | undefined;
  const sockets = new Set<net.Socket>();
  const connections: number[] = [];
  const track = (s: net.Socket) => {
    sockets.add(s);
    s.on("error", () => {});
    s.on("close", () => sockets.delete(s));
  };
  const listen = (handler: (client: net.Socket) => void) =>
    new Promise<void>((resolve, reject) => {
      server = net.createServer((client) => {
        connections.push(Date.now());
        track(client);
        handler(client);
      });
      server.once("error", reject);
      server.listen(listenPort, "127.0.0.1", () => resolve());
    });
  const cut = () =>
    new Promise<void>((resolve) => {
      for (const s of sockets) s.destroy();
      if (!server) return resolve();
      server.close(() => resolve());
      server = undefined;
    });
  return {
    port: listenPort,
    connections,
    cut,
    open: async () => {
      await cut();
      await listen((client) => {
        const upstream = net.connect(targetPort, "127.0.0.1");
        track(upstream);
        client.pipe(upstream).pipe(client);
      });
    },
    refuse: async (greeting) => {
      await cut();
      await listen((client) => client.end(greeting));
    },
  };
}
