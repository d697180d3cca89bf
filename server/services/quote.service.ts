import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import { CAUTIONS } from "../../shared/engine/cautions.js";
import { formatMoney } from "../../shared/money.js";
import type { AcceptQuoteInput, CreateQuoteInput, QuoteSnapshot, QuoteStatus, SendQuoteInput, SnapshotSystem } from "../../shared/schemas/estimates.js";
import { newLinkToken, secretMatches, splitLinkToken } from "../auth/tokens.js";
import { Client, Company, Job, Quote, QuoteEvent, User } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import type { JobQueue } from "../jobs/queue.js";
import type { Mailer } from "../mail/mailer.js";
import { quoteAnsweredMail, quoteMail } from "../mail/templates.js";
import { renderQuotePdf } from "../pdf/quote-pdf.js";
import { getEstimate, jobSystems, presentEstimate } from "./estimate.service.js";
import { solveDocument } from "./system.service.js";
import { companyScope, isUuid } from "./tenancy.js";

export interface QuoteDeps {
  db: DataSource;
  mailer: Mailer;
  publicUrl: string;
  /** The background job queue; absent, a send the mail server refuses answers 502 at once. */
  jobs?: JobQueue | null;
}

/** "Q-2026-0042 R2" */
export const quoteLabel = (q: Pick<Quote, "number" | "revision">) => `${q.number} R${q.revision}`;
export const clientUrl = (publicUrl: string, token: string) => `${publicUrl}/q/${token}`;

const today = () => new Date().toISOString().slice(0, 10);
function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

export async function recordQuoteEvent(manager: EntityManager, quote: Pick<Quote, "id" | "companyId">, type: string, actor: string | null, detail: string | null = null) {
  await manager.insert(QuoteEvent, { companyId: quote.companyId, quoteId: quote.id, type, actor, detail: detail?.slice(0, 1000) ?? null });
}
const event = recordQuoteEvent;

/** The voltage-drop proof of each system, solved now with its limit profile. */
async function snapshotSystems(manager: EntityManager, companyId: string, jobId: string): Promise<SnapshotSystem[]> {
  const systems = await jobSystems(manager, companyId, jobId);
  const out: SnapshotSystem[] = [];
  for (const s of systems) {
    const doc = s.document as {
      points?: Array<{ id: string; name?: string }>;
      runs?: Array<{ id: string; name?: string; from: string; to: string; size: string; returnSize?: string; material?: "copper" | "aluminum"; length: number | string; parallel?: number; fuseA?: number }>;
      loads?: Array<{ id: string; name?: string }>;
    };
    const result = await solveDocument(manager, companyId, s.limitProfileId, s.document);
    const pointName = new Map((doc.points ?? []).map((p) => [p.id, p.name || p.id]));
    const loadName = new Map((doc.loads ?? []).map((l) => [l.id, l.name || l.id]));
    const maxCurrent = new Map<string, number>();
    const ampacity = new Map<string, number | null>();
    if (result.ok) {
      for (const c of result.cases) {
        for (const r of c.runs) {
          maxCurrent.set(r.id, Math.max(maxCurrent.get(r.id) ?? 0, Math.abs(r.current)));
          ampacity.set(r.id, r.ampacityA);
        }
      }
    }
    out.push({
      id: s.id,
      name: s.name,
      nominalVoltage: s.nominalVoltage,
      units: s.units,
      limitProfile: result.ok
        ? { name: result.limitProfile.name ?? "Limit profile", branchPercent: result.limitProfile.branchPercent, totalPercent: result.limitProfile.totalPercent, criticalPercent: result.limitProfile.criticalPercent }
        : { name: "—", branchPercent: 0, totalPercent: 0, criticalPercent: 0 },
      solved: result.ok,
      caseNames: result.ok ? result.cases.map((c) => c.name) : [],
      points: (doc.points ?? []).map((p) => ({ id: p.id, name: p.name || p.id })),
      loads: result.ok
        ? result.loads.map((l) => ({ id: l.id, name: loadName.get(l.id) ?? l.id, worstCase: l.worstCase, voltage: l.voltage, dropPercent: l.dropPercent, limitPercent: l.limitPercent, status: l.status }))
        : [],
      runs: (doc.runs ?? []).map((r) => ({
        id: r.id,
        name: r.name || r.id,
        from: pointName.get(r.from) ?? r.from,
        to: pointName.get(r.to) ?? r.to,
        size: r.size,
        returnSize: r.returnSize && r.returnSize !== r.size ? r.returnSize : null,
        material: r.material ?? "copper",
        length: typeof r.length === "number" ? r.length : Number.NaN,
        parallel: r.parallel ?? 1,
        fuseA: r.fuseA ?? null,
        maxCurrentA: maxCurrent.has(r.id) ? Math.round((maxCurrent.get(r.id) as number) * 100) / 100 : null,
        ampacityA: ampacity.get(r.id) ?? null,
      })).filter((r) => Number.isFinite(r.length)),
      findings: result.ok
        ? result.findings.filter((f) => f.severity !== "info").slice(0, 30).map((f) => ({ severity: f.severity, message: f.message }))
        : result.errors.slice(0, 30).map((e) => ({ severity: "error", message: e.message })),
      document: s.document,
    });
  }
  return out;
}

/**
 * Freezes the estimate as a quote revision (a draft). The next quote number is taken under a lock
 * on the company row; a job's later revisions keep the number. An unsent draft is refreshed in place.
 */
export async function createQuote(db: DataSource, companyId: string, userId: string, jobId: string, input: z.output<typeof CreateQuoteInput>): Promise<Quote> {
  return db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const job = await scope.mustFind(Job, { id: jobId }, "Job", true);
    const estimate = await getEstimate(tx, companyId, jobId).catch(() => {
      throw new AppError("unprocessable", "Build the estimate from the layout before making a quote");
    });
    const view = await presentEstimate(tx, companyId, estimate);
    const missing = view.findings.filter((f) => f.code === "MISSING_PRICE");
    if (missing.length) throw new AppError("unprocessable", `The estimate has ${missing.length} item${missing.length === 1 ? "" : "s"} without a price: add them to the price list and rebuild`, { findings: missing });
    if (view.lines.length === 0) throw new AppError("unprocessable", "The estimate has no lines to quote");
    // The quote prices the estimate's lines and proves the current layout: both must be of one layout.
    if (view.findings.some((f) => f.code === "LAYOUT_CHANGED")) {
      throw new AppError("unprocessable", "A system was changed after the estimate was built: rebuild the estimate from the layout, then make the quote");
    }
    const tooLarge = view.findings.find((f) => f.code === "AMOUNT_TOO_LARGE");
    if (tooLarge) throw new AppError("unprocessable", tooLarge.message);
    const company = await tx.getRepository(Company).createQueryBuilder("c").addSelect("c.logo").where("c.id = :id", { id: companyId }).setLock("pessimistic_write").getOneOrFail();
    const client = await scope.mustFind(Client, { id: job.clientId }, "Client");
    // The job's row is locked above, so a send or a client's answer on this job waits or has finished.
    const latest = await tx.findOne(Quote, { where: { companyId, jobId }, order: { createdAt: "DESC", revision: "DESC" }, lock: { mode: "pessimistic_write" } });
    if (latest && (latest.status === "accepted" || latest.status === "deposit paid")) {
      throw new AppError("conflict", `Quote ${quoteLabel(latest)} was accepted; a new revision cannot replace it`);
    }
    const systems = await snapshotSystems(tx, companyId, jobId);
    const issuedAt = today();
    const validUntil = input.validUntil ?? addDays(issuedAt, company.quoteValidDays);
    if (validUntil < issuedAt) throw new AppError("invalid_input", "validUntil: the quote must be valid until today or later", { fields: { validUntil: "must be today or later" } });
    let number: string;
    let revision: number;
    let draft: Quote | null = null;
    if (latest?.status === "draft" && !latest.supersededAt) {
      draft = latest;
      number = latest.number;
      revision = latest.revision;
    } else if (latest) {
      number = latest.number;
      revision = (await tx.query(`SELECT max(revision) AS r FROM quote WHERE company_id = $1 AND number = $2`, [companyId, latest.number]))[0].r + 1;
    } else {
      company.lastQuoteNumber += 1;
      await tx.update(Company, { id: companyId }, { lastQuoteNumber: company.lastQuoteNumber });
      number = `Q-${issuedAt.slice(0, 4)}-${String(company.lastQuoteNumber).padStart(4, "0")}`;
      revision = 1;
    }
    const snapshot: QuoteSnapshot = {
      company: {
        name: company.name,
        licenceNumber: company.licenceNumber,
        contactEmail: company.contactEmail,
        phone: company.phone,
        address: company.address,
        logo: company.logo && company.logoMediaType ? { mediaType: company.logoMediaType, base64: company.logo.toString("base64") } : null,
      },
      client: { name: client.name, email: client.email, phone: client.phone, billingAddress: client.billingAddress },
      job: { id: job.id, title: job.title, siteAddress: job.siteAddress },
      currency: company.currency,
      number,
      revision,
      issuedAt,
      validUntil,
      terms: input.terms ?? company.quoteTerms,
      scope: [
        `Supply and install the DC cabling for ${job.title}${job.siteAddress ? ` at ${job.siteAddress}` : ""}, as listed below.`,
        ...systems.map((s) => `${s.name}: ${s.nominalVoltage} V system, ${s.runs.length} cable run${s.runs.length === 1 ? "" : "s"}, ${s.loads.length} load${s.loads.length === 1 ? "" : "s"} checked for voltage drop in ${s.caseNames.length} operating case${s.caseNames.length === 1 ? "" : "s"}.`),
      ],
      lines: view.lines,
      totals: view.totals,
      systems,
      cautions: [...CAUTIONS],
      wastePercent: estimate.wastePercent,
    };
    const values = { number, revision, currency: company.currency, totalMinor: view.totals.totalMinor, depositMinor: view.totals.depositMinor, validUntil, snapshot, sendError: null };
    let quote: Quote;
    if (draft) {
      await tx.update(Quote, { id: draft.id }, values as never);
      quote = await tx.findOneByOrFail(Quote, { id: draft.id });
    } else {
      quote = await tx.save(tx.create(Quote, { ...values, companyId, jobId, status: "draft", createdById: userId }));
    }
    const user = await tx.findOneBy(User, { id: userId });
    await event(tx, quote, "created", user?.name ?? null, draft ? "refreshed from the estimate" : null);
    return quote;
  });
}

export async function getQuote(manager: EntityManager, companyId: string, id: string): Promise<Quote> {
  return companyScope(manager, companyId).mustFind(Quote, { id }, "Quote");
}

export async function listJobQuotes(manager: EntityManager, companyId: string, jobId: string): Promise<Quote[]> {
  await companyScope(manager, companyId).mustFind(Job, { id: jobId }, "Job");
  return companyScope(manager, companyId).find(Quote, { where: { jobId }, order: { createdAt: "DESC", revision: "DESC" } });
}

export async function quoteEvents(manager: EntityManager, quoteId: string) {
  return manager.find(QuoteEvent, { where: { quoteId }, order: { at: "ASC" } });
}

export function quotePdf(quote: Quote, acceptUrl: string | null): Promise<Buffer> {
  return renderQuotePdf(quote.snapshot, { label: quoteLabel(quote), acceptUrl });
}

/** What a queued send carries: enough to send as the person who pressed Send. */
export interface QuoteSendJob {
  companyId: string;
  quoteId: string;
  userId: string;
  userName: string;
  to: string;
  message: string | null;
}

export interface SendOutcome {
  quote: Quote;
  /** The mail server did not take it: a job retries with back-off and the quote says "send pending". */
  pending: boolean;
}

/**
 * E-mails the quote with its PDF and a fresh client link. Idempotent per revision: the row is locked
 * for the whole send, so a retry or a double click waits and then finds the quote already sent.
 * When the mail server does not take the e-mail, the quote stays a draft marked "send pending" and a
 * job queued in the same transaction keeps trying with back-off (without a job queue the failure
 * answers 502). Pressing Send again while pending tries again at once; it queues nothing more.
 */
export async function sendQuote(deps: QuoteDeps, companyId: string, user: { userId: string; name: string }, id: string, input: z.output<typeof SendQuoteInput>): Promise<SendOutcome> {
  const { db, jobs } = deps;
  let failure: string | null = null;
  const outcome = await db.transaction(async (tx): Promise<SendOutcome> => {
    const found = await companyScope(tx, companyId).mustFind(Quote, { id }, "Quote");
    // One lock order for everything that changes quotes: the job, then every revision of the
    // quote by revision. A send, a new revision and a client's answer on the same job queue up
    // instead of deadlocking, and no revision is answered while a later one is being sent.
    await lockJobAndRevisions(tx, companyId, found.jobId, found.number);
    const quote = await tx.findOneByOrFail(Quote, { id });
    if (quote.status !== "draft") return { quote, pending: false };
    await assertSendable(tx, quote);
    const to = input.to ?? quote.snapshot.client.email;
    if (!to) throw new AppError("invalid_input", "to: the client has no e-mail address; give one", { fields: { to: "the client has no e-mail address" } });
    const job: QuoteSendJob = { companyId, quoteId: id, userId: user.userId, userName: user.name, to, message: input.message ?? null };
    failure = await deliverQuote(deps, tx, quote, job);
    if (!failure) return { quote: await tx.findOneByOrFail(Quote, { id }), pending: false };
    if (!jobs) return { quote, pending: false };
    if (!quote.sendPendingAt) {
      await tx.update(Quote, { id }, { sendPendingAt: new Date(), sendError: `The e-mail could not be sent yet: ${failure}` });
      await event(tx, quote, "send_pending", user.name, failure);
      await jobs.enqueue(tx, "quote-send", job);
    } else {
      await tx.update(Quote, { id }, { sendError: `The e-mail could not be sent yet: ${failure}` });
    }
    return { quote: await tx.findOneByOrFail(Quote, { id }), pending: true };
  });
  if (outcome.pending) return outcome;
  if (failure) {
    await db.transaction(async (tx) => {
      await tx.update(Quote, { id, companyId }, { sendError: `The e-mail could not be sent: ${failure}` });
      await event(tx, { id, companyId }, "send_failed", user.name, failure);
    });
    throw new AppError("mail_failed", `The e-mail could not be sent (${failure}); the quote stays a draft — try again`);
  }
  return outcome;
}

/** Refuses a draft that must not go out any more (a conflict naming why). */
async function assertSendable(tx: EntityManager, quote: Quote): Promise<void> {
  if (quote.supersededAt) throw new AppError("conflict", "A later revision of this quote was sent; send that one");
  // A draft made before the client accepted an earlier revision must not supersede the accepted one.
  const answered: unknown[] = await tx.query(`SELECT 1 FROM quote WHERE company_id = $1 AND number = $2 AND revision <> $3 AND status IN ('accepted', 'deposit paid') LIMIT 1`, [quote.companyId, quote.number, quote.revision]);
  if (answered.length) throw new AppError("conflict", `The client accepted an earlier revision of ${quote.number}; this draft cannot replace it`);
  if (quote.validUntil < today()) throw new AppError("conflict", `This draft was valid until ${quote.validUntil}; make a new revision from the estimate`);
}

/**
 * One attempt to e-mail a locked draft; on success the quote is marked sent (with a new link, the
 * earlier revisions superseded, the job quoted). Returns why it failed, or null.
 */
async function deliverQuote(deps: QuoteDeps, tx: EntityManager, quote: Quote, job: QuoteSendJob): Promise<string | null> {
  const link = newLinkToken();
  const url = clientUrl(deps.publicUrl, link.token);
  const label = quoteLabel(quote);
  const pdf = await quotePdf(quote, url);
  const s = quote.snapshot;
  try {
    await deps.mailer.send({
      ...quoteMail({
        to: job.to,
        companyName: s.company.name,
        clientName: s.client.name,
        label,
        jobTitle: s.job.title,
        total: formatMoney(s.totals.totalMinor, s.currency),
        deposit: formatMoney(s.totals.depositMinor, s.currency),
        validUntil: s.validUntil,
        url,
        message: job.message ?? undefined,
        senderName: job.userName,
      }),
      attachments: [{ filename: `${label.replace(/\s+/g, "-")}.pdf`, content: pdf, contentType: "application/pdf" }],
    });
  } catch (error) {
    return error instanceof Error ? error.message.slice(0, 400) : "the mail server refused the message";
  }
  const now = new Date();
  await tx.update(Quote, { id: quote.id }, { status: "sent", sentAt: now, sentTo: job.to, sentById: job.userId, sendError: null, sendPendingAt: null, linkId: link.id, linkHash: link.hash });
  // The earlier revisions' links now answer "superseded".
  await tx.query(
    `UPDATE quote SET superseded_at = $1 WHERE company_id = $2 AND number = $3 AND revision < $4 AND superseded_at IS NULL AND status NOT IN ('accepted', 'deposit paid')`,
    [now, quote.companyId, quote.number, quote.revision],
  );
  await tx.query(`UPDATE job SET status = 'quoted', updated_at = now() WHERE id = $1 AND status = 'lead'`, [quote.jobId]);
  await event(tx, quote, "sent", job.userName, `to ${job.to}`);
  return null;
}

/**
 * The queued send (the "quote-send" job): another attempt under the same locks. A quote sent or
 * changed meanwhile is left alone; a failure with attempts left throws so the queue retries later;
 * the last failure ends "send pending" with the error and a send_failed event.
 */
export async function runQueuedQuoteSend(deps: QuoteDeps, job: QuoteSendJob, attempt: { retryCount: number; retryLimit: number }): Promise<void> {
  let retry: string | null = null;
  await deps.db.transaction(async (tx) => {
    const found = await tx.findOneBy(Quote, { id: job.quoteId, companyId: job.companyId });
    if (!found) return;
    await lockJobAndRevisions(tx, job.companyId, found.jobId, found.number);
    const quote = await tx.findOneByOrFail(Quote, { id: job.quoteId });
    if (quote.status !== "draft" || !quote.sendPendingAt) return;
    try {
      await assertSendable(tx, quote);
    } catch (error) {
      const why = error instanceof AppError ? error.message : "the quote can no longer be sent";
      await tx.update(Quote, { id: quote.id }, { sendPendingAt: null, sendError: `Not sent: ${why}` });
      await event(tx, quote, "send_failed", job.userName, why);
      return;
    }
    const failure = await deliverQuote(deps, tx, quote, job);
    if (!failure) return;
    // The request that queued the job was attempt 1.
    const attempts = attempt.retryCount + 2;
    if (attempt.retryCount >= attempt.retryLimit) {
      await tx.update(Quote, { id: quote.id }, { sendPendingAt: null, sendError: `The e-mail could not be sent after ${attempts} attempts: ${failure}` });
      await event(tx, quote, "send_failed", job.userName, `gave up after ${attempts} attempts: ${failure}`);
      return;
    }
    await tx.update(Quote, { id: quote.id }, { sendError: `The e-mail could not be sent yet (attempt ${attempts}): ${failure}` });
    retry = failure;
  });
  if (retry) throw new Error(`quote ${job.quoteId}: ${retry}`);
}

export async function lockJobAndRevisions(tx: EntityManager, companyId: string, jobId: string, number: string) {
  await tx.query(`SELECT id FROM job WHERE id = $1 AND company_id = $2 FOR UPDATE`, [jobId, companyId]);
  await tx.query(`SELECT id FROM quote WHERE company_id = $1 AND number = $2 ORDER BY revision FOR UPDATE`, [companyId, number]);
}

/** A fresh client link for a sent quote; the previous one stops working. */
export async function issueLink(deps: QuoteDeps, companyId: string, actor: string, id: string): Promise<string> {
  return deps.db.transaction(async (tx) => {
    const quote = await companyScope(tx, companyId).mustFind(Quote, { id }, "Quote", true);
    if (quote.status === "draft") throw new AppError("conflict", "Send the quote first; a draft has no client link");
    if (quote.supersededAt) throw new AppError("conflict", "A later revision of this quote was sent; its link is the one to share");
    const link = newLinkToken();
    await tx.update(Quote, { id }, { linkId: link.id, linkHash: link.hash });
    await event(tx, quote, "link_issued", actor);
    return clientUrl(deps.publicUrl, link.token);
  });
}

export async function revokeLink(db: DataSource, companyId: string, actor: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const quote = await companyScope(tx, companyId).mustFind(Quote, { id }, "Quote", true);
    // The id stays, so the old link can say it was stopped rather than "not found".
    await tx.update(Quote, { id }, { linkHash: null });
    await event(tx, quote, "link_revoked", actor);
  });
}

// ---------------------------------------------------------------- the client's side

/** The quote a client link opens, or the 404/410 explaining why it does not. Locks the row when `lock`. */
export async function quoteForToken(manager: EntityManager, token: string, lock = false): Promise<Quote> {
  const closed = (status: "not_found" | "gone", reason: string, company: Company | null) =>
    new AppError(status, reason === "unknown" ? "We could not find this quote" : `This quote link no longer works (${reason})`, {
      reason,
      companyName: company?.name ?? null,
      contactEmail: company?.contactEmail ?? null,
      phone: company?.phone ?? null,
    });
  const dot = typeof token === "string" ? token.indexOf(".") : -1;
  if (dot < 0 || token.length > 200 || !isUuid(token.slice(0, dot))) throw closed("not_found", "unknown", null);
  const { id, secret } = splitLinkToken(token);
  const query = manager.getRepository(Quote).createQueryBuilder("q").addSelect("q.linkHash").where("q.link_id = :id", { id });
  if (lock) query.setLock("pessimistic_write");
  const quote = await query.getOne();
  if (!quote) throw closed("not_found", "unknown", null);
  const company = await manager.findOneBy(Company, { id: quote.companyId });
  if (quote.linkHash === null) throw closed("gone", "revoked", company);
  if (!secretMatches(secret, quote.linkHash)) throw closed("not_found", "unknown", null);
  if (quote.supersededAt) throw closed("gone", "superseded", company);
  if (quote.status === "expired") throw closed("gone", "expired", company);
  return quote;
}

const OPEN: QuoteStatus[] = ["sent", "viewed"];
const lapsed = (q: Quote) => OPEN.includes(q.status) && q.validUntil < today();

/** 410 for a quote past its valid-until date, with whom to ask (ClosedLinkDetails). */
async function expiredError(manager: EntityManager, q: Quote): Promise<AppError> {
  const company = await manager.findOneBy(Company, { id: q.companyId });
  return new AppError("gone", "This quote has expired; ask the contractor for a new one", { reason: "expired", companyName: company?.name ?? null, contactEmail: company?.contactEmail ?? null, phone: company?.phone ?? null });
}

/** Opens the quote for the client: the first open marks it viewed; a lapsed one becomes expired. */
export async function openQuoteLink(db: DataSource, token: string): Promise<Quote> {
  const outcome = await db.transaction(async (tx) => {
    const quote = await quoteForToken(tx, token, true);
    if (lapsed(quote)) {
      await tx.update(Quote, { id: quote.id }, { status: "expired" });
      await event(tx, quote, "expired", null);
      return "expired" as const;
    }
    if (quote.status === "sent") {
      await tx.update(Quote, { id: quote.id }, { status: "viewed", viewedAt: new Date() });
      await event(tx, quote, "viewed", quote.snapshot.client.name);
      quote.status = "viewed";
    }
    return quote;
  });
  // Expiry is committed first, then the link answers like any expired one.
  if (outcome === "expired") return quoteForToken(db.manager, token);
  return outcome;
}

export async function quoteLinkPdf(db: DataSource, token: string, publicUrl: string): Promise<{ quote: Quote; pdf: Buffer }> {
  const quote = await quoteForToken(db.manager, token);
  if (lapsed(quote)) throw await expiredError(db.manager, quote);
  return { quote, pdf: await quotePdf(quote, clientUrl(publicUrl, token)) };
}

async function notifySender(deps: QuoteDeps, quote: Quote, answer: "accepted" | "declined", byName: string | null, reason: string | null) {
  const sender = quote.sentById ? await deps.db.manager.findOneBy(User, { id: quote.sentById }) : null;
  const to = sender?.email ?? quote.snapshot.company.contactEmail;
  if (!to) return;
  await deps.mailer.send(
    quoteAnsweredMail({
      to,
      companyName: quote.snapshot.company.name,
      label: quoteLabel(quote),
      jobTitle: quote.snapshot.job.title,
      clientName: quote.snapshot.client.name,
      answer,
      byName,
      reason,
      url: `${deps.publicUrl}/jobs/${quote.jobId}/quotes/${quote.id}`,
    }),
  );
}

export async function answerQuoteLink(
  deps: QuoteDeps,
  token: string,
  answer: { kind: "accept"; input: z.output<typeof AcceptQuoteInput>; ip: string | null; userAgent: string | null } | { kind: "decline"; reason: string | null },
  onMailError: (error: unknown) => void,
): Promise<Quote> {
  const quote = await deps.db.transaction(async (tx) => {
    const found = await quoteForToken(tx, token);
    // The same lock order as a send (job, then the revisions), then the link is checked again.
    await lockJobAndRevisions(tx, found.companyId, found.jobId, found.number);
    const q = await quoteForToken(tx, token);
    if (lapsed(q)) throw await expiredError(tx, q);
    if (!OPEN.includes(q.status)) throw new AppError("conflict", `This quote was already ${q.status === "declined" ? "declined" : "accepted"}`);
    const now = new Date();
    if (answer.kind === "accept") {
      await tx.update(Quote, { id: q.id }, { status: "accepted", acceptedAt: now, acceptedName: answer.input.name, acceptedIp: answer.ip?.slice(0, 64) ?? null, acceptedUserAgent: answer.userAgent?.slice(0, 500) ?? null, viewedAt: q.viewedAt ?? now });
      await tx.update(Job, { id: q.jobId }, { status: "won", updatedAt: now });
      await event(tx, q, "accepted", answer.input.name);
    } else {
      await tx.update(Quote, { id: q.id }, { status: "declined", declinedAt: now, declineReason: answer.reason, viewedAt: q.viewedAt ?? now });
      await tx.update(Job, { id: q.jobId }, { status: "lost", updatedAt: now });
      await event(tx, q, "declined", q.snapshot.client.name, answer.reason);
    }
    return tx.findOneByOrFail(Quote, { id: q.id });
  });
  // The answer is recorded first; a mail failure is logged, never undoes it.
  await notifySender(deps, quote, quote.status === "accepted" ? "accepted" : "declined", quote.acceptedName, quote.declineReason).catch(onMailError);
  return quote;
}
