// A PostgreSQL cluster owned by the project: created with initdb in a project
// folder, started with pg_ctl on 127.0.0.1 and a port of our own. The
// machine's default cluster and port 5432 are never touched.
//
// PostgreSQL refuses to run as root, so when we are root every server command
// runs as the unprivileged `postgres` system user, on folders that user owns.
import { spawnSync, type SpawnSyncReturns } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync, unlinkSync, chownSync, chmodSync } from "node:fs";
import path from "node:path";
import pg from "pg";
import { StartupError } from "./startup-error.js";

export const DB_SUPERUSER = "runwright";

export interface LocalPostgresOptions {
  /** Folder that holds the cluster (`data/`), its socket and its log. */
  root: string;
  /** TCP port on 127.0.0.1. */
  port: number;
  /** Name of the env var that changes the port, for messages. */
  portVariable: string;
  /** Name of the env var that changes the folder, for messages. */
  rootVariable: string;
  /** Throwaway clusters skip fsync: faster, and nothing in them must survive a crash. */
  throwaway?: boolean;
  log?: (line: string) => void;
}

interface ServerUser {
  name: string;
  uid: number;
  gid: number;
}

export class LocalPostgres {
  readonly dataDir: string;
  readonly logFile: string;
  private binDir = "";
  private startedHere = false;
  private readonly log: (line: string) => void;

  constructor(private readonly options: LocalPostgresOptions) {
    this.dataDir = path.join(options.root, "data");
    this.logFile = path.join(options.root, "server.log");
    this.log = options.log ?? (() => {});
  }

  get port(): number {
    return this.options.port;
  }

  /** Connection URL for a database in this cluster (trust auth, loopback only). */
  url(database: string): string {
    return `postgres://${DB_SUPERUSER}@127.0.0.1:${this.options.port}/${database}`;
  }

  /**
   * Makes sure the cluster exists and a server is running on it. Reuses a
   * server already running on the same folder (then `stop()` leaves it alone).
   */
  async ensureRunning(): Promise<void> {
    this.binDir = ensureServerBinaries();
    const user = serverUser();
    this.prepareFolder(user);
    if (!existsSync(path.join(this.dataDir, "PG_VERSION"))) this.initCluster();

    const running = this.runningServerPort();
    if (running !== undefined) {
      if (running !== this.options.port) {
        throw new StartupError(
          `PostgreSQL is already running on ${this.dataDir} with port ${running}, not ${this.options.port}; ` +
            `set ${this.options.portVariable}=${running} or stop it first (npm run db -- stop).`,
        );
      }
      this.log(`PostgreSQL already running on 127.0.0.1:${running}; reusing it.`);
      return;
    }
    this.removeStalePid();
    this.startServer();
    this.startedHere = true;
  }

  /** Creates the database if it does not exist yet. */
  async ensureDatabase(name: string): Promise<void> {
    const client = new pg.Client({ connectionString: this.url("postgres"), connectionTimeoutMillis: 5000 });
    await client.connect();
    try {
      const found = await client.query("SELECT 1 FROM pg_database WHERE datname = $1", [name]);
      if (found.rowCount === 0) await client.query(`CREATE DATABASE "${name.replaceAll('"', '""')}"`);
    } finally {
      await client.end();
    }
  }

  /** Stops the server if this object started it. */
  stop(options: { force?: boolean } = {}): void {
    if (!this.startedHere && !options.force) return;
    if (!existsSync(path.join(this.dataDir, "postmaster.pid")) || !this.knownBinaries()) return;
    this.run("pg_ctl", ["-D", this.dataDir, "-m", "fast", "-w", "-t", "30", "stop"]);
    this.startedHere = false;
  }

  /** Port of the server running on this cluster, or undefined. */
  runningServerPort(): number | undefined {
    const pidFile = path.join(this.dataDir, "postmaster.pid");
    if (!existsSync(pidFile) || !this.knownBinaries()) return undefined;
    const status = this.run("pg_ctl", ["-D", this.dataDir, "status"]);
    if (status.status !== 0) return undefined;
    // postmaster.pid line 4 holds the port the server listens on.
    const port = Number(readFileSync(pidFile, "utf8").split("\n")[3]);
    return Number.isInteger(port) ? port : undefined;
  }

  /** The binaries' folder if PostgreSQL is installed; never installs (for stop and status). */
  private knownBinaries(): string | undefined {
    if (!this.binDir) {
      try {
        this.binDir = findServerBinaries() ?? "";
      } catch {
        this.binDir = "";
      }
    }
    return this.binDir || undefined;
  }

  private prepareFolder(user: ServerUser): void {
    const root = this.options.root;
    mkdirSync(root, { recursive: true });
    if (existsSync(this.dataDir)) {
      const owner = statSync(this.dataDir).uid;
      if (owner !== user.uid) {
        throw new StartupError(
          `The database folder ${this.dataDir} is owned by uid ${owner}, but PostgreSQL runs here as ${user.name} (uid ${user.uid}); ` +
            `run as that user, change the folder's owner, or set ${this.options.rootVariable} to another folder.`,
        );
      }
    }
    if (isRoot()) {
      chownSync(root, user.uid, user.gid);
      chmodSync(root, 0o700);
      // The postgres user must be able to reach the folder through every parent.
      const probe = spawnSync("runuser", ["-u", user.name, "--", "test", "-w", root]);
      if (probe.status !== 0) {
        throw new StartupError(
          `The ${user.name} user cannot reach ${root} (a parent folder is not open to other users); ` +
            `set ${this.options.rootVariable} to a folder it can reach, e.g. /var/tmp/runwright.`,
        );
      }
    }
  }

  private initCluster(): void {
    this.log("Creating the PostgreSQL cluster…");
    const args = ["-D", this.dataDir, "-U", DB_SUPERUSER, "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"];
    if (this.options.throwaway) args.push("--no-sync");
    const result = this.run("initdb", args);
    if (result.status !== 0) {
      throw new StartupError(`initdb failed for ${this.dataDir}: ${lastLine(result.stderr) || "no message"}`);
    }
  }

  private removeStalePid(): void {
    const pidFile = path.join(this.dataDir, "postmaster.pid");
    if (!existsSync(pidFile)) return;
    const pid = Number(readFileSync(pidFile, "utf8").split("\n")[0]);
    if (Number.isInteger(pid) && pid > 0 && isPostgresProcess(pid)) return;
    // Left behind by a crash: the process it names is gone (or is not PostgreSQL).
    this.log(`Removing stale ${pidFile} (process ${pid} is not running).`);
    unlinkSync(pidFile);
  }

  private startServer(): void {
    const settings = [
      `-c port=${this.options.port}`,
      "-c listen_addresses=127.0.0.1",
      `-c unix_socket_directories=${this.options.root}`,
    ];
    if (this.options.throwaway) settings.push("-c fsync=off", "-c synchronous_commit=off", "-c full_page_writes=off");
    const result = this.run("pg_ctl", ["-D", this.dataDir, "-l", this.logFile, "-w", "-t", "30", "-o", settings.join(" "), "start"]);
    if (result.status === 0) return;
    const log = existsSync(this.logFile) ? readFileSync(this.logFile, "utf8") : "";
    if (/Address already in use|could not bind/i.test(log.slice(-4000))) {
      throw new StartupError(
        `Port ${this.options.port} on 127.0.0.1 is already in use, so PostgreSQL cannot start; set ${this.options.portVariable} to another port.`,
      );
    }
    throw new StartupError(
      `PostgreSQL did not start on port ${this.options.port}: ${lastLine(log) || lastLine(result.stderr) || "no message"} (log: ${this.logFile})`,
    );
  }

  private run(command: string, args: string[]): SpawnSyncReturns<string> {
    const binary = path.join(this.binDir, command);
    return isRoot()
      ? spawnSync("runuser", ["-u", "postgres", "--", binary, ...args], { encoding: "utf8" })
      : spawnSync(binary, args, { encoding: "utf8" });
  }
}

/**
 * True when the user PostgreSQL runs as can walk into dir (or, if dir does not
 * exist yet, into its nearest existing parent). Always true when not root.
 */
export function serverUserCanReach(dir: string): boolean {
  if (!isRoot()) return true;
  let existing = path.resolve(dir);
  while (!existsSync(existing)) existing = path.dirname(existing);
  return spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", existing]).status === 0;
}

function isRoot(): boolean {
  return process.getuid?.() === 0;
}

function serverUser(): ServerUser {
  if (!isRoot()) return { name: process.env.USER ?? "you", uid: process.getuid!(), gid: process.getgid!() };
  const id = spawnSync("id", ["-u", "postgres"], { encoding: "utf8" });
  const gid = spawnSync("id", ["-g", "postgres"], { encoding: "utf8" });
  if (id.status !== 0) {
    throw new StartupError("The postgres system user is missing; install PostgreSQL with: apt-get install -y postgresql");
  }
  return { name: "postgres", uid: Number(id.stdout.trim()), gid: Number(gid.stdout.trim()) };
}

/** The newest /usr/lib/postgresql/<major>/bin holding a server, or PG_BIN_DIR when set. */
export function findServerBinaries(): string | undefined {
  const override = process.env.PG_BIN_DIR;
  if (override) {
    if (existsSync(path.join(override, "pg_ctl"))) return override;
    throw new StartupError(`PG_BIN_DIR is ${override}, which holds no pg_ctl; point it at PostgreSQL's server binaries or unset it.`);
  }
  const base = "/usr/lib/postgresql";
  if (!existsSync(base)) return undefined;
  const majors = readdirSync(base)
    .filter((name) => existsSync(path.join(base, name, "bin", "postgres")))
    .sort((a, b) => Number(b) - Number(a));
  return majors.length > 0 ? path.join(base, majors[0], "bin") : undefined;
}

/** The server binaries' folder; installs them with apt-get first when they are missing and we are root. */
export function ensureServerBinaries(): string {
  return findServerBinaries() ?? installServerBinaries();
}

function installServerBinaries(): string {
  const command = "apt-get update && apt-get install -y postgresql";
  if (!isRoot()) {
    throw new StartupError(`PostgreSQL's server binaries are not installed; install them with: sudo sh -c '${command}'`);
  }
  console.log(`PostgreSQL's server binaries are missing; running: ${command}`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const update = spawnSync("apt-get", ["update"], { stdio: "inherit", env });
  const install = update.status === 0 ? spawnSync("apt-get", ["install", "-y", "postgresql"], { stdio: "inherit", env }) : update;
  const found = findServerBinaries();
  if (install.status !== 0 || !found) {
    throw new StartupError(`Installing PostgreSQL failed; run this yourself and try again: ${command}`);
  }
  return found;
}

function isPostgresProcess(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch (error) {
    // EPERM means it exists but belongs to someone else (the postgres user).
    if ((error as NodeJS.ErrnoException).code !== "EPERM") return false;
  }
  try {
    return readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("postgres");
  } catch {
    return true; // no /proc: trust that the process is ours
  }
}

function lastLine(text: string | null | undefined): string {
  const lines = (text ?? "").split("\n").map((line) => line.trim()).filter(Boolean);
  return lines.at(-1) ?? "";
}
