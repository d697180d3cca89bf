// What each background job does. Every instance that runs workers registers the same handlers;
// the queue hands each job to one of them.
import { runQueuedReceipt, type PaymentDeps } from "../services/payment.service.js";
import { runQueuedQuoteSend, type QuoteDeps, type QuoteSendJob } from "../services/quote.service.js";
import type { JobQueue } from "./queue.js";

export async function startWorkers(jobs: JobQueue, deps: QuoteDeps & PaymentDeps): Promise<void> {
  await jobs.work<QuoteSendJob>("quote-send", (data, attempt) => runQueuedQuoteSend(deps, data, attempt));
  await jobs.work<{ paymentId: string }>("payment-receipt", (data) => runQueuedReceipt(deps, data));
}
