// What each background job does. Every instance that runs workers registers the same handlers;
// the queue hands each job to one of them.
import type { QuoteDeps, QuoteSendJob } from "../services/quote.service.js";
import { runQueuedQuoteSend } from "../services/quote.service.js";
import type { JobQueue } from "./queue.js";

export async function startWorkers(jobs: JobQueue, deps: QuoteDeps): Promise<void> {
  await jobs.work<QuoteSendJob>("quote-send", (data, attempt) => runQueuedQuoteSend(deps, data, attempt));
}
