import { formatMoney } from "../../shared/money.js";
import type { QuoteSnapshot } from "../../shared/schemas/estimates.js";
import { FONT } from "./fonts.js";
import { addPageFooters, contentBox, COPPER, COPPER_TINT, createPdf, drawLetterhead, infoColumns, INK, MUTED, paragraph, sectionHeading, TYPE } from "./pdf-document.js";

export interface ReceiptPdfInput {
  company: QuoteSnapshot["company"];
  client: QuoteSnapshot["client"];
  jobTitle: string;
  siteAddress: string | null;
  /** "Q-2026-0042 R2" */
  quoteLabel: string;
  receiptNumber: string;
  amountMinor: number;
  refundedMinor: number;
  currency: string;
  paidAt: Date;
  payerName: string | null;
  /** Stripe's payment reference, for the client's bank statement queries. */
  reference: string;
  quoteTotalMinor: number;
}

const dateTime = (d: Date) => `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;

/** A one-page receipt for a deposit paid online: who was paid, by whom, how much, for which quote. */
export async function renderReceiptPdf(input: ReceiptPdfInput): Promise<Buffer> {
  const { doc, bytes } = createPdf({ title: `Receipt ${input.receiptNumber}`, subject: `Deposit on quote ${input.quoteLabel}`, author: input.company.name });
  const money = (minor: number) => formatMoney(minor, input.currency);
  drawLetterhead(doc, { company: input.company, title: "Receipt", facts: [input.receiptNumber, `Paid ${dateTime(input.paidAt)}`, `Quote ${input.quoteLabel}`] });
  infoColumns(doc, [
    { heading: "Received from", lines: [input.payerName ?? input.client.name, input.payerName && input.payerName !== input.client.name ? `for ${input.client.name}` : null, input.client.email, input.client.billingAddress] },
    { heading: "For", lines: [`Deposit on quote ${input.quoteLabel}`, input.jobTitle, input.siteAddress] },
  ]);

  sectionHeading(doc, "Payment");
  const rows: Array<[string, string, boolean]> = [
    ["Deposit received", money(input.amountMinor), true],
    ["Paid by", "Card, online through Stripe", false],
    ["Payment reference", input.reference, false],
    ["Quote total", formatMoney(input.quoteTotalMinor, input.currency), false],
    ["Balance after this deposit", formatMoney(Math.max(input.quoteTotalMinor - input.amountMinor, 0), input.currency), false],
  ];
  if (input.refundedMinor > 0) rows.push(["Refunded since", `− ${money(input.refundedMinor)}`, true]);
  const box = contentBox(doc);
  const labelWidth = 180;
  for (const [label, value, strong] of rows) {
    const y = doc.y;
    if (strong) doc.rect(box.left, y, box.width, 18).fillColor(COPPER_TINT).fill();
    doc.font(FONT.regular).fontSize(TYPE.body).fillColor(MUTED).text(label, box.left + 6, y + 4, { width: labelWidth, lineBreak: false });
    doc.font(strong ? FONT.bold : FONT.regular).fontSize(strong ? 10.5 : TYPE.body).fillColor(INK).text(value, box.left + labelWidth + 12, y + 4, { width: box.width - labelWidth - 18 });
    doc.y = Math.max(doc.y, y + 18);
  }
  doc.moveTo(box.left, doc.y + 2).lineTo(box.right, doc.y + 2).lineWidth(1).strokeColor(COPPER).stroke();
  doc.x = box.left;
  doc.y += 10;
  paragraph(doc, `Amounts in ${input.currency}. Thank you — ${input.company.name} will be in touch to schedule the work.`, { size: TYPE.small, color: MUTED });
  paragraph(doc, "Keep this receipt with your quote. The balance is due as set out in the quote's terms.", { size: TYPE.small, color: MUTED });

  addPageFooters(doc, `${input.company.name}  ·  Receipt ${input.receiptNumber}  ·  Quote ${input.quoteLabel}`);
  doc.end();
  return bytes;
}
