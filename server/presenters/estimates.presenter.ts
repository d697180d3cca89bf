import type { EntityManager } from "typeorm";
import type { EstimatingSettings, PriceItem as PriceItemView, QuoteDetail, QuoteSummary } from "../../shared/schemas/estimates.js";
import { User, type Company, type PriceItem, type Quote, type QuoteEvent } from "../db/entities/index.js";
import { quoteLabel } from "../services/quote.service.js";

export function presentPriceItem(i: PriceItem): PriceItemView {
  return {
    id: i.id,
    sku: i.sku,
    description: i.description,
    category: i.category,
    unit: i.unit,
    unitCostMinor: i.unitCostMinor,
    sellPriceMinor: i.sellPriceMinor,
    cableSize: i.cableSize,
    cableMaterial: i.cableMaterial,
    conductors: i.conductors,
    ratingA: i.ratingA,
    updatedAt: i.updatedAt.toISOString(),
  };
}

export function presentEstimatingSettings(c: Company, hasLogo: boolean): EstimatingSettings {
  return {
    wastePercent: c.wastePercent,
    labourMinutesPerRun: c.labourMinutesPerRun,
    labourMinutesPerMetre: c.labourMinutesPerMetre,
    labourMinutesPerTermination: c.labourMinutesPerTermination,
    quoteValidDays: c.quoteValidDays,
    quoteTerms: c.quoteTerms,
    hasLogo,
  };
}

/** Names of the members who sent these quotes. */
export async function senderNames(manager: EntityManager, quotes: Quote[]): Promise<Map<string, string>> {
  const ids = [...new Set(quotes.map((q) => q.sentById).filter((id): id is string => id !== null))];
  if (ids.length === 0) return new Map();
  const users = await manager.getRepository(User).createQueryBuilder("u").where("u.id IN (:...ids)", { ids }).getMany();
  return new Map(users.map((u) => [u.id, u.name]));
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function presentQuoteSummary(q: Quote, senders: Map<string, string>): QuoteSummary {
  return {
    id: q.id,
    jobId: q.jobId,
    jobTitle: q.snapshot.job.title,
    clientName: q.snapshot.client.name,
    number: q.number,
    revision: q.revision,
    label: quoteLabel(q),
    status: q.status,
    superseded: q.supersededAt !== null,
    currency: q.currency,
    totalMinor: q.totalMinor,
    depositMinor: q.depositMinor,
    validUntil: q.validUntil,
    sentAt: iso(q.sentAt),
    sentTo: q.sentTo,
    sentBy: q.sentById ? (senders.get(q.sentById) ?? null) : null,
    sendError: q.sendError,
    sendPendingSince: iso(q.sendPendingAt),
    viewedAt: iso(q.viewedAt),
    acceptedAt: iso(q.acceptedAt),
    acceptedName: q.acceptedName,
    declinedAt: iso(q.declinedAt),
    declineReason: q.declineReason,
    linkActive: q.linkId !== null && q.supersededAt === null && q.status !== "draft" && q.status !== "expired" && q.linkHash !== null,
    createdAt: q.createdAt.toISOString(),
  };
}

export function presentQuoteDetail(q: Quote, senders: Map<string, string>, events: QuoteEvent[], payments: QuoteDetail["payments"]): QuoteDetail {
  return {
    ...presentQuoteSummary(q, senders),
    snapshot: q.snapshot,
    events: events.map((e) => ({ type: e.type as QuoteDetail["events"][number]["type"], at: e.at.toISOString(), actor: e.actor, detail: e.detail })),
    acceptedIp: q.acceptedIp,
    acceptedUserAgent: q.acceptedUserAgent,
    payments,
  };
}
