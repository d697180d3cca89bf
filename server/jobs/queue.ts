// Background jobs in PostgreSQL, through pg-boss: work that must not be lost when a request fails
// half-way or the process stops — today the quote e-mails the mail server did not take. pg-boss keeps
// its tables in its own schema (`pgboss`), which it creates and migrates itself on start; our
// TypeORM migrations never touch it. Today: the quote e-mails the mail server did not take, and
// deposit receipts (queued with the payment, sent right away, and again later only if they did not go). Jobs are fetched with SKIP LOCKED, so when several app
// processes share the database each job is done by one of them.
import { randomBytes } from "node:crypto";
import PgBoss from "pg-boss";
import type { Logger } from "pino";
import type { EntityManager } from "typeorm";

/** The queues of the app, by job kind. */
export const JOB_KINDS = ["quote-send", "payment-receipt"] as const;
export type JobKind = (typeof JOB_KINDS)[number];

export interface RetryPolicy {
  /** Retries after the first attempt. */
  retryLimit: number;
  /** Seconds before the first retry; each later one waits about twice as long (with jitter). */
  retryDelay: number;
}

/** Production: about 30 s, 1, 2, 4, 8 and 16 minutes — half an hour of trying in all. */
export const DEFAULT_RETRY: RetryPolicy = { retryLimit: 6, retryDelay: 30 };

export interface JobQueueOptions {
  url: string;
  logger?: Logger;
  /**
   * Put before every queue name. Instances that share the work share the prefix (production uses
   * none); the test suite gives each test app its own, so one test's workers never take another's jobs.
   */
  prefix?: string;
  retry?: RetryPolicy;
  /** How often an idle worker looks for work (pg-boss's minimum is 0.5 s); 2 s by default. */
  pollingSeconds?: number;
}

export interface JobInfo {
  id: string;
  /** Attempts that ended in an error so far (0 on the first attempt). */
  retryCount: number;
  retryLimit: number;
}

export type JobHandler<T> = (data: T, job: JobInfo) => Promise<void>;

export class JobQueue {
  readonly prefix: string;
  readonly retry: RetryPolicy;
  private readonly boss: PgBoss;
  private readonly pollingSeconds: number;
  private readonly workers = new Map<JobKind, string>();
  private started = false;

  constructor(private readonly options: JobQueueOptions) {
    this.prefix = options.prefix ?? "";
    this.retry = options.retry ?? DEFAULT_RETRY;
    this.pollingSeconds = options.pollingSeconds ?? 2;
    // Maintenance (archiving finished jobs, expiring stuck ones) runs in every instance; pg-boss
    // takes an advisory lock so only one does it at a time. No cron schedules are used.
    this.boss = new PgBoss({ connectionString: options.url, max: 3, schedule: false, application_name: "runwright-jobs" });
    // A lost database connection is reported here and pg-boss keeps polling: the jobs wait in
    // the database and run once it answers again.
    this.boss.on("error", (error) => options.logger?.warn({ err: error }, "job queue: database error; retrying"));
  }

  name(kind: JobKind): string {
    return `${this.prefix}${kind}`;
  }

  /** Installs or migrates pg-boss's schema if needed and makes the queues. */
  async start(): Promise<void> {
    await this.boss.start();
    this.started = true;
    for (const kind of JOB_KINDS) {
      if (!(await this.boss.getQueue(this.name(kind)))) {
        await this.boss.createQueue(this.name(kind), { name: this.name(kind), retryLimit: this.retry.retryLimit, retryDelay: this.retry.retryDelay, retryBackoff: true, expireInSeconds: 120 }).catch(async (error) => {
          // Another instance made it at the same moment.
          if (!(await this.boss.getQueue(this.name(kind)))) throw error;
        });
      }
    }
  }

  /**
   * Queues a job inside the caller's transaction: it exists only if the transaction commits, and
   * it is not lost if the process stops right after.
   */
  async enqueue(tx: EntityManager, kind: JobKind, data: object): Promise<string> {
    const db: PgBoss.Db = { executeSql: async (text, values) => ({ rows: await tx.query(text, values) }) };
    // The first queued attempt waits like a retry: whatever just failed is given time to recover.
    // The policy goes with each job too, so a changed setting applies to the next job (the queue keeps the one it was made with).
    const id = await this.boss.send(this.name(kind), data, { db, startAfter: this.retry.retryDelay, retryLimit: this.retry.retryLimit, retryDelay: this.retry.retryDelay, retryBackoff: true });
    if (!id) throw new Error(`The ${kind} job was not queued`);
    return id;
  }

  /** Runs `handler` for each job of the kind; a thrown error fails the attempt and pg-boss retries later. */
  async work<T>(kind: JobKind, handler: JobHandler<T>): Promise<void> {
    const id = await this.boss.work<T>(this.name(kind), { pollingIntervalSeconds: this.pollingSeconds, batchSize: 1, includeMetadata: true }, async (jobs) => {
      for (const job of jobs) {
        try {
          await handler(job.data, { id: job.id, retryCount: job.retryCount, retryLimit: job.retryLimit });
        } catch (error) {
          this.options.logger?.warn({ err: error, job: job.id, kind, attempt: job.retryCount + 1 }, "job failed; it will be retried if attempts are left");
          throw error;
        }
      }
    });
    this.workers.set(kind, id);
  }

  /** A job's state as pg-boss has it (for tests and the operator). */
  async state(kind: JobKind, id: string): Promise<{ state: string; retryCount: number } | null> {
    const job = await this.boss.getJobById(this.name(kind), id, { includeArchive: true });
    return job ? { state: job.state, retryCount: job.retryCount } : null;
  }

  /** Stops fetching, lets running jobs finish (at most timeoutMs), closes the pool. */
  async stop({ timeoutMs = 10000, dropQueues = false } = {}): Promise<void> {
    if (!this.started) return;
    this.started = false;
    if (dropQueues) {
      for (const kind of JOB_KINDS) {
        await this.boss.offWork(this.name(kind)).catch(() => {});
        await this.boss.deleteQueue(this.name(kind)).catch(() => {});
      }
    }
    await this.boss.stop({ graceful: true, wait: true, timeout: timeoutMs, close: true });
  }
}

/** A fresh prefix for an isolated set of queues (tests). */
export function uniqueQueuePrefix(): string {
  return `t${randomBytes(5).toString("hex")}_`;
}
