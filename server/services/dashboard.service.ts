import type { DataSource } from "typeorm";
import { QUOTE_STATUSES, type Dashboard, type QuoteStatus } from "../../shared/schemas/estimates.js";
import { Company, Quote } from "../db/entities/index.js";
import { presentQuoteSummary, senderNames } from "../presenters/estimates.presenter.js";
import { depositTotals } from "./payment.service.js";
import { quoteLabel } from "./quote.service.js";

/** The dashboard's figures, from queries over the company's quotes, their events and systems. */
export async function dashboardFor(db: DataSource, companyId: string, now = new Date()): Promise<Dashboard> {
  const company = await db.manager.findOneByOrFail(Company, { id: companyId });
  const monthStart = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 1));
  // This month: the live revision of each quote (not superseded), by its status, counted when it
  // was made or answered this month.
  const rows: Array<{ status: QuoteStatus; n: string; total: string }> = await db.query(
    `SELECT status, count(*) AS n, coalesce(sum(total_minor), 0) AS total FROM quote
      WHERE company_id = $1 AND superseded_at IS NULL AND greatest(created_at, updated_at) >= $2
      GROUP BY status`,
    [companyId, monthStart],
  );
  const byStatus = QUOTE_STATUSES.map((status) => {
    const row = rows.find((r) => r.status === status);
    return { status, count: Number(row?.n ?? 0), totalMinor: Number(row?.total ?? 0) };
  });
  const weekAgo = new Date(now.getTime() - 7 * 24 * 3600 * 1000);
  const awaitingRows = await db
    .getRepository(Quote)
    .createQueryBuilder("q")
    .where("q.company_id = :companyId AND q.superseded_at IS NULL AND q.status IN ('sent', 'viewed') AND q.sent_at < :weekAgo", { companyId, weekAgo })
    .orderBy("q.sent_at", "ASC")
    .take(20)
    .getMany();
  const senders = await senderNames(db.manager, awaitingRows);
  const activityRows: Array<{ quote_id: string; type: string; at: Date; actor: string | null; number: string; revision: number; job_id: string; job_title: string; client_name: string }> = await db.query(
    `SELECT e.quote_id, e.type, e.at, e.actor, q.number, q.revision, q.job_id, q.snapshot->'job'->>'title' AS job_title, q.snapshot->'client'->>'name' AS client_name
       FROM quote_event e JOIN quote q ON q.id = e.quote_id
      WHERE e.company_id = $1 AND e.type IN ('sent', 'viewed', 'accepted', 'declined', 'expired', 'send_failed', 'deposit_paid', 'payment_flagged', 'refunded')
      ORDER BY e.at DESC LIMIT 20`,
    [companyId],
  );
  const over: Array<{ id: string; name: string; job_id: string; title: string; over: string }> = await db.query(
    `SELECT s.id, s.name, s.job_id, j.title, (s.last_solve->>'over') AS over FROM system s JOIN job j ON j.id = s.job_id
      WHERE s.company_id = $1 AND (s.last_solve->>'over')::int > 0 AND j.status IN ('lead', 'quoted')
      ORDER BY s.updated_at DESC LIMIT 20`,
    [companyId],
  );
  return {
    currency: company.currency,
    month: monthStart.toISOString().slice(0, 7),
    byStatus,
    awaiting: awaitingRows.map((q) => presentQuoteSummary(q, senders)),
    activity: activityRows.map((r) => ({
      quoteId: r.quote_id,
      label: quoteLabel({ number: r.number, revision: r.revision }),
      jobId: r.job_id,
      jobTitle: r.job_title,
      clientName: r.client_name,
      type: r.type,
      at: new Date(r.at).toISOString(),
      actor: r.actor,
    })),
    overLimitSystems: over.map((r) => ({ systemId: r.id, systemName: r.name, jobId: r.job_id, jobTitle: r.title, over: Number(r.over) })),
    deposits: await depositTotals(db, companyId, monthStart),
  };
}
