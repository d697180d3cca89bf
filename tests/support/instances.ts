// App instances as separate processes (`npm run serve`'s entry), as a deployment runs them: each its
// own port, all on one database.
import { spawn, type ChildProcess } from "node:child_process";
import { projectRoot } from "../../server/scripts/project-root.js";

export interface Instance {
  url: string;
  child: ChildProcess;
  /** Everything it printed. */
  output: string[];
  /** Resolves with the exit code. */
  exited: Promise<number | null>;
  kill(signal?: NodeJS.Signals): void;
}

/** Starts server/scripts/serve.ts with the given environment; resolves once it says it is serving. */
export async function startInstance(env: Record<string, string>, timeoutMs = 60_000): Promise<Instance> {
  const child = spawn(process.execPath, ["--import", "tsx", "server/scripts/serve.ts"], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: "test", LOG_LEVEL: "warn", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const output: string[] = [];
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the instance did not start within ${timeoutMs} ms:\n${output.join("")}`)), timeoutMs);
    const read = (chunk: Buffer) => {
      output.push(chunk.toString());
      if (/is serving http/.test(output.join(""))) {
        clearTimeout(timer);
        resolve();
      }
    };
    child.stdout!.on("data", read);
    child.stderr!.on("data", (chunk: Buffer) => output.push(chunk.toString()));
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`the instance exited with ${code} before serving:\n${output.join("")}`));
    });
  });
  return { url: `http://127.0.0.1:${env.PORT}`, child, output, exited, kill: (signal = "SIGTERM") => void child.kill(signal) };
}
