import { expect } from "vitest";
import { uniqueEmail } from "./accounts.js";
import type { ApiClient } from "./api.js";
import { linkIn, waitForMail } from "./mail.js";

/** What the example cabin (shared/engine/examples/cabin-24v.json) needs priced: cable, lugs, fuses and a holder. */
export const CABIN_PRICES = [
  { sku: "T-CU-16", description: "Copper cable 16 mm²", category: "cable", unit: "m", unitCostMinor: 460, cableSize: "16 mm2", cableMaterial: "copper", conductors: 1 },
  { sku: "T-CU-2.5", description: "Copper cable 2.5 mm²", category: "cable", unit: "m", unitCostMinor: 85, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 1 },
  { sku: "T-LUG", description: "Crimp lug, any size", category: "termination", unit: "each", unitCostMinor: 120 },
  { sku: "T-FUSE-60", description: "60 A fuse", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 60 },
  { sku: "T-FUSE-80", description: "80 A fuse", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 80 },
  { sku: "T-FH", description: "Fuse holder", category: "fuse", unit: "each", unitCostMinor: 1475 },
] as const;

export interface QuoteWork {
  priceItemId: string;
  quoteId: string;
  /** The client link from the e-mail: http://…/q/<token> */
  clientLink: string;
  token: string;
  clientEmail: string;
}

/** Prices the cabin, builds the job's estimate, makes a quote and sends it; returns the e-mailed link. */
export async function createQuoteWork(api: ApiClient, jobId: string, baseUrl: string): Promise<QuoteWork> {
  let priceItemId = "";
  for (const item of CABIN_PRICES) {
    const created = await api.post("/api/price-list", item);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    priceItemId ||= created.body.id;
  }
  const estimate = await api.post(`/api/jobs/${jobId}/estimate/generate`);
  expect(estimate.status, JSON.stringify(estimate.body)).toBe(200);
  const quote = await api.post(`/api/jobs/${jobId}/quotes`, {});
  expect(quote.status, JSON.stringify(quote.body)).toBe(201);
  const clientEmail = uniqueEmail("client");
  const sent = await api.post(`/api/quotes/${quote.body.id}/send`, { to: clientEmail });
  expect(sent.status, JSON.stringify(sent.body)).toBe(200);
  const mail = await waitForMail(clientEmail);
  const clientLink = linkIn(mail, `${baseUrl}/q/`);
  return { priceItemId, quoteId: quote.body.id, clientLink, token: clientLink.slice(clientLink.lastIndexOf("/") + 1), clientEmail };
}
