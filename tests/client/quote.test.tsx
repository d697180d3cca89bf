import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { QuoteDetail } from "../../shared/schemas/estimates";
import type { Payment } from "../../shared/schemas/payments";
import { apiError, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const JOB_ID = "6c3d4e5f-6a7b-4c8d-9e0f-000000000001";
const QUOTE_ID = "7a1b2c3d-4e5f-4a6b-8c7d-000000000002";
const QUOTE = `GET /api/quotes/${QUOTE_ID}`;
const SEND = `POST /api/quotes/${QUOTE_ID}/send`;
const LINK = `/api/quotes/${QUOTE_ID}/link`;

function quote(extra: Partial<QuoteDetail> = {}): QuoteDetail {
  return {
    id: QUOTE_ID,
    jobId: JOB_ID,
    jobTitle: "Cabin battery bank",
    clientName: "Ridge Cabins Ltd",
    number: "Q-2026-0042",
    revision: 2,
    label: "Q-2026-0042 R2",
    status: "draft",
    superseded: false,
    currency: "USD",
    totalMinor: 185_112,
    depositMinor: 55_534,
    validUntil: "2026-12-31",
    sentAt: null,
    sentTo: null,
    sentBy: null,
    sendError: null,
    sendPendingSince: null,
    viewedAt: null,
    acceptedAt: null,
    acceptedName: null,
    declinedAt: null,
    declineReason: null,
    linkActive: false,
    createdAt: "2026-12-01T09:00:00.000Z",
    acceptedIp: null,
    acceptedUserAgent: null,
    events: [{ type: "created", at: "2026-12-01T09:00:00.000Z", actor: "Ada Quill", detail: null }],
    payments: [],
    snapshot: {
      company: { name: "Kestrel Bay DC Works", licenceNumber: "EC-20417", contactEmail: "office@kestrel.example", phone: null, address: null, logo: null },
      client: { name: "Ridge Cabins Ltd", email: "office@ridge.example", phone: null, billingAddress: null },
      job: { id: JOB_ID, title: "Cabin battery bank", siteAddress: "12 Lake Road, North Fork" },
      currency: "USD",
      number: "Q-2026-0042",
      revision: 2,
      issuedAt: "2026-12-01T09:00:00.000Z",
      validUntil: "2026-12-31",
      terms: "30 % deposit on acceptance.",
      scope: ["House bank: 24 V"],
      lines: [
        { key: "cable:16 mm2:copper", source: "layout", category: "cable", description: "16 mm² copper cable", detail: "", sku: "CU16-RB", quantity: 88, unit: "m", unitCostMinor: 450, markupPercent: 30, costMinor: 39_600, sellMinor: 51_480, overridden: false },
        { key: "labour", source: "layout", category: "labour", description: "Labour", detail: "", sku: null, quantity: 3.5, unit: "hour", unitCostMinor: 6500, markupPercent: 0, costMinor: 22_750, sellMinor: 22_750, overridden: false },
        { key: "manual:1", source: "manual", category: "other", description: "Cable tray and fixings", detail: "added by hand", sku: null, quantity: 1, unit: "each", unitCostMinor: 4000, markupPercent: 30, costMinor: 4000, sellMinor: 5200, overridden: false },
      ],
      totals: { costMinor: 66_350, subtotalMinor: 79_430, discountMinor: 0, taxableMinor: 79_430, taxRatePercent: 8, taxMinor: 6354, totalMinor: 85_784, depositMinor: 25_735, marginMinor: 13_080 },
      systems: [
        {
          id: "8e5f6a7b-8c9d-4e0f-9a1b-2c3d4e5f6a7b",
          name: "House bank",
          nominalVoltage: 24,
          units: "metric",
          limitProfile: { name: "Standard 3 / 5 %", branchPercent: 3, totalPercent: 5, criticalPercent: 2 },
          solved: true,
          caseNames: ["Full charge", "Low battery, hot day"],
          points: [],
          loads: [
            { id: "pump", name: "Well pump", worstCase: "Low battery, hot day", voltage: 21.9, dropPercent: 6.24, limitPercent: 5, status: "over" },
            { id: "lights", name: "Cabin lights", worstCase: "Low battery, hot day", voltage: 23.1, dropPercent: 2.1, limitPercent: 3, status: "within" },
          ],
          runs: [],
          findings: [],
          document: {},
        },
      ],
      cautions: ["Keep the battery room ventilated."],
      wastePercent: 10,
    },
    ...extra,
  };
}

const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp });

describe("the Quote screen", () => {
  it("shows the revision with its status, lines, totals, voltage drop, cautions, PDF links and history", async () => {
    const api = stubApi({ ...base(), [QUOTE]: { body: quote({ sendError: "Mailbox unavailable (550)" }) } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const title = await screen.findByRole("heading", { level: 1, name: "Q-2026-0042 R2" });
    expect(title.parentElement?.textContent).toContain("Draft");
    expect(screen.getByRole("link", { name: /Cabin battery bank/ }).getAttribute("href")).toBe(`/jobs/${JOB_ID}`);
    const main = screen.getByRole("main");
    expect(main.textContent).toContain("Not sent yet");
    expect(main.textContent).toContain("Valid until");
    expect(screen.getByRole("alert").textContent).toContain("Mailbox unavailable (550)");

    const lines = screen.getByRole("table", { name: "Quoted lines by category" });
    expect(within(lines).getAllByRole("rowgroup").slice(1).map((g) => g.getAttribute("aria-label"))).toEqual(["Cable", "Labour", "Other"]);
    expect(within(lines).getByText("16 mm² copper cable").closest("tr")?.textContent).toContain("$514.80");
    expect(lines.textContent).not.toContain("$396.00");
    const totals = screen.getByRole("region", { name: "Totals" });
    expect(totals.textContent).toContain("$857.84");
    expect(totals.textContent).toContain("$257.35");

    const drop = screen.getByRole("table", { name: "Voltage drop per load of House bank" });
    const pump = within(drop).getByText("Well pump").closest("tr") as HTMLElement;
    expect(pump.textContent).toContain("6.24 %");
    expect(pump.textContent).toContain("Over limit");
    expect(within(drop).getByText("Cabin lights").closest("tr")?.textContent).toContain("Within limit");
    expect(screen.getByRole("region", { name: "Safety cautions" }).textContent).toContain("Keep the battery room ventilated.");

    expect(screen.getByRole("link", { name: "Open PDF" }).getAttribute("href")).toBe(`/api/quotes/${QUOTE_ID}/pdf`);
    expect(screen.getByRole("link", { name: "Download PDF" }).getAttribute("href")).toBe(`/api/quotes/${QUOTE_ID}/pdf?download=1`);
    const history = screen.getByRole("list", { name: "History" });
    expect(history.textContent).toContain("Quote created");
    expect(history.textContent).toContain("Ada Quill");
    expect(screen.queryByRole("region", { name: "Acceptance" })).toBeNull();
    expect(api.unexpected).toEqual([]);
  });

  it("sends the quote to the client's address with a message, then shows it sent", async () => {
    let sent = false;
    const sentQuote = quote({
      status: "sent",
      sentAt: "2026-12-02T10:00:00.000Z",
      sentTo: "accounts@ridge.example",
      sentBy: "Ada Quill",
      linkActive: true,
      events: [...quote().events, { type: "sent", at: "2026-12-02T10:00:00.000Z", actor: "Ada Quill", detail: "to accounts@ridge.example" }],
    });
    const api = stubApi({
      ...base(),
      [QUOTE]: () => ({ body: sent ? sentQuote : quote() }),
      [SEND]: () => {
        sent = true;
        return { body: sentQuote };
      },
    });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    fireEvent.click(await screen.findByRole("button", { name: "Send to client" }));
    const dialog = screen.getByRole("dialog", { name: "Send Q-2026-0042 R2 to the client" });
    const to = within(dialog).getByLabelText("To") as HTMLInputElement;
    expect(to.value).toBe("office@ridge.example");
    fireEvent.change(to, { target: { value: "not an address" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Send quote" }));
    expect(await within(dialog).findByText("this is not an e-mail address")).toBeTruthy();
    expect(api.callsTo(SEND)).toHaveLength(0);

    fireEvent.change(to, { target: { value: "accounts@ridge.example" } });
    fireEvent.change(within(dialog).getByLabelText("Message (optional)"), { target: { value: "Here is the revised quote with the larger feeder." } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Send quote" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(SEND).map((c) => c.body)).toEqual([{ to: "accounts@ridge.example", message: "Here is the revised quote with the larger feeder." }]);
    const title = screen.getByRole("heading", { level: 1, name: "Q-2026-0042 R2" });
    expect(title.parentElement?.textContent).toContain("Sent");
    expect(screen.getByRole("main").textContent).toContain("to accounts@ridge.example by Ada Quill");
    expect(screen.getByRole("list", { name: "History" }).textContent).toContain("Sent to the client");
    expect(screen.queryByRole("button", { name: "Send to client" })).toBeNull();
  });

  it("leaves out an empty message, and shows why the mail failed, reading the quote again", async () => {
    let failed = false;
    const api = stubApi({
      ...base(),
      [QUOTE]: () => ({ body: failed ? quote({ sendError: "Recipient address rejected" }) : quote() }),
      [SEND]: () => {
        failed = true;
        return apiError(502, "mail_failed", "The mail server refused the message: Recipient address rejected.");
      },
    });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    fireEvent.click(await screen.findByRole("button", { name: "Send to client" }));
    const dialog = screen.getByRole("dialog");
    fireEvent.click(within(dialog).getByRole("button", { name: "Send quote" }));
    const alert = await within(dialog).findByRole("alert");
    expect(alert.textContent).toContain("The mail server refused the message: Recipient address rejected.");
    expect(api.callsTo(SEND).map((c) => c.body)).toEqual([{ to: "office@ridge.example" }]);
    await waitFor(() => expect(api.callsTo(QUOTE)).toHaveLength(2));
    fireEvent.click(within(dialog).getByRole("button", { name: "Cancel" }));
    expect((await screen.findByRole("alert")).textContent).toContain("Recipient address rejected");
  });

  it("makes a new client link to copy, and stops the link after asking", async () => {
    const writeText = vi.fn(async () => {});
    Object.defineProperty(navigator, "clipboard", { value: { writeText }, configurable: true });
    let active = true;
    const api = stubApi({
      ...base(),
      [QUOTE]: () => ({ body: quote({ status: "viewed", sentAt: "2026-12-02T10:00:00.000Z", viewedAt: "2026-12-03T08:00:00.000Z", linkActive: active }) }),
      [`POST ${LINK}`]: { body: { url: "https://runwright.example/q/3fZpQ8rW1kLmN0vXyT5a" } },
      [`DELETE ${LINK}`]: () => {
        active = false;
        return { status: 204 };
      },
    });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    fireEvent.click(await screen.findByRole("button", { name: "New client link" }));
    const dialog = await screen.findByRole("dialog", { name: "New client link" });
    expect((within(dialog).getByLabelText("Client link") as HTMLInputElement).value).toBe("https://runwright.example/q/3fZpQ8rW1kLmN0vXyT5a");
    fireEvent.click(within(dialog).getByRole("button", { name: "Copy link" }));
    expect(await within(dialog).findByText("Copied.")).toBeTruthy();
    expect(writeText).toHaveBeenCalledWith("https://runwright.example/q/3fZpQ8rW1kLmN0vXyT5a");
    fireEvent.click(within(dialog).getByRole("button", { name: "Close" }));

    fireEvent.click(screen.getByRole("button", { name: "Stop the client link" }));
    const confirm = screen.getByRole("dialog", { name: "Stop the client link?" });
    fireEvent.click(within(confirm).getByRole("button", { name: "Stop the link" }));
    expect(await screen.findByRole("status", { name: "The client link no longer works." })).toBeTruthy();
    await waitFor(() => expect(screen.queryByRole("button", { name: "Stop the client link" })).toBeNull());
    expect(api.callsTo(`POST ${LINK}`)).toHaveLength(1);
    expect(api.callsTo(`DELETE ${LINK}`)).toHaveLength(1);
    Reflect.deleteProperty(navigator, "clipboard");
  });

  it("shows an accepted quote's acceptance record and the cut list", async () => {
    stubApi({
      ...base(),
      [QUOTE]: {
        body: quote({
          status: "accepted",
          sentAt: "2026-12-02T10:00:00.000Z",
          acceptedAt: "2026-12-04T16:20:00.000Z",
          acceptedName: "Morgan Ridge",
          acceptedIp: "203.0.113.24",
          acceptedUserAgent: "Mozilla/5.0 (iPad; CPU OS 17_0 like Mac OS X)",
          events: [...quote().events, { type: "accepted", at: "2026-12-04T16:20:00.000Z", actor: "Morgan Ridge", detail: null }],
        }),
      },
    });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const record = await screen.findByRole("region", { name: "Acceptance" });
    expect(record.textContent).toContain("Morgan Ridge");
    expect(record.textContent).toContain("203.0.113.24");
    expect(record.textContent).toContain("Mozilla/5.0 (iPad; CPU OS 17_0 like Mac OS X)");
    expect(within(record).getByRole("link", { name: "Cut list PDF" }).getAttribute("href")).toBe(`/api/jobs/${JOB_ID}/cut-list.pdf`);
    expect(screen.getByRole("heading", { level: 1 }).parentElement?.textContent).toContain("Accepted");
    expect(screen.getByRole("list", { name: "History" }).textContent).toContain("Accepted by the client");
  });

  it("marks a superseded revision and offers no sending", async () => {
    stubApi({ ...base(), [QUOTE]: { body: quote({ superseded: true }) } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const title = await screen.findByRole("heading", { level: 1, name: "Q-2026-0042 R2" });
    expect(title.parentElement?.textContent).toContain("Superseded");
    expect(screen.queryByRole("button", { name: "Send to client" })).toBeNull();
  });

  it("gives an Installer the quote without sending or link buttons", async () => {
    stubApi({ ...base("installer"), [QUOTE]: { body: quote({ status: "sent", sentAt: "2026-12-02T10:00:00.000Z", linkActive: true }) } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    await screen.findByRole("heading", { level: 1, name: "Q-2026-0042 R2" });
    expect(screen.queryByRole("button", { name: "Send to client" })).toBeNull();
    expect(screen.queryByRole("button", { name: "New client link" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Stop the client link" })).toBeNull();
    expect(screen.getByRole("link", { name: "Open PDF" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "Download PDF" })).toBeTruthy();
  });

  it("answers an unknown quote with Quote not found and the way back to the job", async () => {
    stubApi({ ...base(), [QUOTE]: apiError(404, "not_found", "Quote not found") });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    expect(await screen.findByRole("heading", { name: "Quote not found" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "Back to the job" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}`);
  });
});

const PAYMENT_ID = "9b1c2d3e-4f5a-4b6c-8d7e-000000000003";
const FLAGGED_ID = "9b1c2d3e-4f5a-4b6c-8d7e-000000000004";
const REFUNDS = `POST /api/payments/${PAYMENT_ID}/refunds`;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

function payment(extra: Partial<Payment> = {}): Payment {
  return {
    id: PAYMENT_ID,
    quoteId: QUOTE_ID,
    jobId: JOB_ID,
    quoteLabel: "Q-2026-0042 R2",
    receiptNumber: "R-2026-0007",
    status: "paid",
    mismatchReason: null,
    amountMinor: 55_534,
    currency: "USD",
    expectedAmountMinor: 55_534,
    expectedCurrency: "USD",
    refundedMinor: 0,
    paidAt: "2026-12-05T10:15:00.000Z",
    payerName: "Morgan Ridge",
    payerEmail: "morgan@ridge.example",
    receiptSentAt: "2026-12-05T10:16:00.000Z",
    receiptError: null,
    stripePaymentIntentId: "pi_3PqR5sT6uV7wX8yZ",
    refunds: [],
    ...extra,
  };
}

/** Partly refunded: $100.00 of $555.34 back, $455.34 left. */
const partlyRefunded = () =>
  payment({
    status: "partially refunded",
    refundedMinor: 10_000,
    refunds: [{ id: "re_1", amountMinor: 10_000, currency: "USD", reason: "requested_by_customer", status: "succeeded", createdAt: "2026-12-06T08:00:00.000Z", createdBy: "Ada Quill" }],
  });
const flagged = () =>
  payment({
    id: FLAGGED_ID,
    receiptNumber: "R-2026-0008",
    status: "mismatch",
    mismatchReason: "Paid after the deposit had already been received",
    amountMinor: 55_534,
    receiptSentAt: null,
    receiptError: "Mailbox full (552)",
    paidAt: "2026-12-07T11:00:00.000Z",
  });

const acceptedQuote = (extra: Partial<QuoteDetail> = {}) =>
  quote({
    status: "deposit paid",
    sentAt: "2026-12-02T10:00:00.000Z",
    acceptedAt: "2026-12-04T16:20:00.000Z",
    acceptedName: "Morgan Ridge",
    linkActive: true,
    events: [
      ...quote().events,
      { type: "accepted", at: "2026-12-04T16:20:00.000Z", actor: "Morgan Ridge", detail: null },
      { type: "deposit_paid", at: "2026-12-05T10:15:00.000Z", actor: null, detail: "R-2026-0007" },
      { type: "refunded", at: "2026-12-06T08:00:00.000Z", actor: "Ada Quill", detail: null },
      { type: "payment_flagged", at: "2026-12-07T11:00:00.000Z", actor: null, detail: "Paid after the deposit had already been received" },
    ],
    payments: [partlyRefunded(), flagged()],
    ...extra,
  });

/** The text of everything an input's aria-describedby points at (its error and hint). */
function descriptionOf(input: HTMLElement): string {
  const ids = input.getAttribute("aria-describedby")?.split(" ") ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent ?? "").join(" ");
}

describe("the quote's payments", () => {
  it("lists each payment with its receipt, status, payer, refunds and receipt e-mail, and the history names them", async () => {
    const api = stubApi({ ...base("owner"), [QUOTE]: { body: acceptedQuote() } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const section = await screen.findByRole("region", { name: "Payments" });
    const items = within(within(section).getByRole("list", { name: "Payments" })).getAllByRole("listitem", { name: /^Receipt / });
    expect(items).toHaveLength(2);

    const first = within(section).getByRole("listitem", { name: "Receipt R-2026-0007" });
    expect(first.textContent).toContain("Partly refunded");
    expect(first.textContent).toContain("$555.34");
    expect(first.textContent).toContain("by Morgan Ridge (morgan@ridge.example)");
    expect(first.textContent).toContain("Refunded $100.00 of $555.34");
    const refunds = within(first).getByRole("list", { name: "Refunds of R-2026-0007" });
    expect(refunds.textContent).toContain("$100.00");
    expect(refunds.textContent).toContain("by Ada Quill");
    expect(refunds.textContent).toContain("Requested by the client");
    expect(first.textContent).toContain("Receipt e-mailed to the client");
    expect(within(first).getByRole("link", { name: "Receipt PDF" }).getAttribute("href")).toBe(`/api/payments/${PAYMENT_ID}/receipt.pdf`);

    const second = within(section).getByRole("listitem", { name: "Receipt R-2026-0008" });
    expect(second.textContent).toContain("Check this payment");
    expect(second.textContent).toContain("Paid after the deposit had already been received");
    expect(second.textContent).toContain("The receipt e-mail failed: Mailbox full (552)");
    expect(within(second).getByRole("link", { name: "Receipt PDF" }).getAttribute("href")).toBe(`/api/payments/${FLAGGED_ID}/receipt.pdf`);

    // The Owner may refund whatever is left of either.
    expect(within(first).getByRole("button", { name: "Refund" })).toBeTruthy();
    expect(within(second).getByRole("button", { name: "Refund" })).toBeTruthy();

    const history = screen.getByRole("list", { name: "History" });
    expect(history.textContent).toContain("Deposit paid");
    expect(history.textContent).toContain("Refunded");
    expect(history.textContent).toContain("Payment flagged");
    expect(history.textContent).not.toContain("payment_flagged");
    expect(api.unexpected).toEqual([]);
  });

  it("says there are no payments yet, and where an accepted quote's client pays", async () => {
    stubApi({ ...base("owner"), [QUOTE]: { body: quote({ status: "accepted", sentAt: "2026-12-02T10:00:00.000Z", acceptedAt: "2026-12-04T16:20:00.000Z", acceptedName: "Morgan Ridge" }) } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const section = await screen.findByRole("region", { name: "Payments" });
    expect(section.textContent).toBe("PaymentsNo payments yet. The client can pay the deposit from their quote page.");
    expect(within(section).queryByRole("button", { name: "Refund" })).toBeNull();
  });

  it("says only that there are no payments on a quote that is not accepted", async () => {
    stubApi({ ...base("owner"), [QUOTE]: { body: quote() } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const section = await screen.findByRole("region", { name: "Payments" });
    expect(section.textContent).toBe("PaymentsNo payments yet.");
  });

  it("checks the refund's amount before sending anything", async () => {
    const api = stubApi({ ...base("owner"), [QUOTE]: { body: acceptedQuote() }, [REFUNDS]: { status: 201, body: partlyRefunded() } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const first = await screen.findByRole("listitem", { name: "Receipt R-2026-0007" });
    fireEvent.click(within(first).getByRole("button", { name: "Refund" }));
    const dialog = screen.getByRole("dialog", { name: "Refund R-2026-0007" });
    const amount = within(dialog).getByLabelText("Amount to refund") as HTMLInputElement;
    // What is left, to start with.
    expect(amount.value).toBe("455.34");
    expect(within(dialog).getByText("Refund $455.34 to the client?")).toBeTruthy();
    expect(within(dialog).getAllByRole("option").map((o) => o.textContent)).toEqual(["Requested by the client", "Paid twice", "Suspected fraud"]);

    fireEvent.change(amount, { target: { value: "455.35" } });
    expect(within(dialog).getByText("Enter an amount to refund.")).toBeTruthy();
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));
    await waitFor(() => expect(amount.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(amount)).toContain("at most $455.34 is left to refund");

    fireEvent.change(amount, { target: { value: "0.00" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));
    await waitFor(() => expect(descriptionOf(amount)).toContain("the amount must be more than zero"));

    fireEvent.change(amount, { target: { value: "12,50" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));
    await waitFor(() => expect(descriptionOf(amount)).toContain("enter the amount as a number, such as 455.34"));

    expect(api.callsTo(REFUNDS)).toHaveLength(0);
    fireEvent.click(within(dialog).getByRole("button", { name: "Cancel" }));
    expect(screen.queryByRole("dialog")).toBeNull();
  });

  it("refunds the amount typed, in cents, with the reason chosen, then reads the quote again", async () => {
    let refunded = false;
    const after = payment({
      status: "partially refunded",
      refundedMinor: 22_050,
      refunds: [...partlyRefunded().refunds, { id: "re_2", amountMinor: 12_050, currency: "USD", reason: "duplicate", status: "succeeded", createdAt: "2026-12-08T09:00:00.000Z", createdBy: "Ada Quill" }],
    });
    const api = stubApi({
      ...base("owner"),
      [QUOTE]: () => ({ body: refunded ? acceptedQuote({ payments: [after, flagged()] }) : acceptedQuote() }),
      [REFUNDS]: () => {
        refunded = true;
        return { status: 201, body: after };
      },
    });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const first = await screen.findByRole("listitem", { name: "Receipt R-2026-0007" });
    fireEvent.click(within(first).getByRole("button", { name: "Refund" }));
    const dialog = screen.getByRole("dialog", { name: "Refund R-2026-0007" });
    fireEvent.change(within(dialog).getByLabelText("Amount to refund"), { target: { value: " $120.5 " } });
    fireEvent.change(within(dialog).getByLabelText("Reason"), { target: { value: "duplicate" } });
    expect(within(dialog).getByText("Refund $120.50 to the client?")).toBeTruthy();
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));

    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(REFUNDS).map((c) => c.body)).toEqual([{ amountMinor: 12_050, reason: "duplicate", requestId: expect.stringMatching(UUID) }]);
    expect(await screen.findByRole("status", { name: "$120.50 refunded to the client on R-2026-0007." })).toBeTruthy();
    await waitFor(() => expect(api.callsTo(QUOTE)).toHaveLength(2));
    await waitFor(() => expect(screen.getByRole("listitem", { name: "Receipt R-2026-0007" }).textContent).toContain("Refunded $220.50 of $555.34"));
    expect(screen.getByRole("list", { name: "Refunds of R-2026-0007" }).textContent).toContain("Paid twice");
  });

  it("shows the server's refusal in the dialog: beside the amount, or as an alert", async () => {
    let reply = apiError(400, "invalid_input", "amountMinor: at most 45534 is left to refund", { fields: { amountMinor: "at most 45534 is left to refund" } });
    const api = stubApi({ ...base("owner"), [QUOTE]: { body: acceptedQuote() }, [REFUNDS]: () => reply });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const first = await screen.findByRole("listitem", { name: "Receipt R-2026-0007" });
    fireEvent.click(within(first).getByRole("button", { name: "Refund" }));
    const dialog = screen.getByRole("dialog", { name: "Refund R-2026-0007" });
    const amount = within(dialog).getByLabelText("Amount to refund");
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));
    await waitFor(() => expect(amount.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(amount)).toContain("at most 45534 is left to refund");
    expect(within(dialog).queryByRole("alert")).toBeNull();
    expect(api.callsTo(REFUNDS).map((c) => c.body)).toEqual([{ amountMinor: 45_534, reason: "requested_by_customer", requestId: expect.stringMatching(UUID) }]);

    reply = apiError(409, "conflict", "Stripe refused the refund (The charge has been disputed.); reload the payment to see what has been refunded");
    fireEvent.click(within(dialog).getByRole("button", { name: "Refund" }));
    expect((await within(dialog).findByRole("alert")).textContent).toContain("Stripe refused the refund (The charge has been disputed.)");
    expect(screen.getByRole("dialog", { name: "Refund R-2026-0007" })).toBeTruthy();
    expect(api.callsTo(REFUNDS)).toHaveLength(2);
    // The same dialog retried: the same request id, so the server refunds at most once.
    const [firstId, secondId] = api.callsTo(REFUNDS).map((c) => (c.body as { requestId: string }).requestId);
    expect(secondId).toBe(firstId);
  });

  it.each(["estimator", "installer"] as const)("lists the payments for an %s without a Refund button", async (role) => {
    stubApi({ ...base(role), [QUOTE]: { body: acceptedQuote() } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const section = await screen.findByRole("region", { name: "Payments" });
    expect(within(section).getByRole("listitem", { name: "Receipt R-2026-0007" })).toBeTruthy();
    expect(within(section).getByRole("listitem", { name: "Receipt R-2026-0008" })).toBeTruthy();
    expect(within(section).queryByRole("button", { name: "Refund" })).toBeNull();
  });

  it("offers no refund of a payment refunded in full", async () => {
    stubApi({ ...base("owner"), [QUOTE]: { body: acceptedQuote({ payments: [payment({ status: "refunded", refundedMinor: 55_534 })] }) } });
    renderAt(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    const item = await screen.findByRole("listitem", { name: "Receipt R-2026-0007" });
    expect(item.textContent).toContain("Refunded");
    expect(within(item).queryByRole("button", { name: "Refund" })).toBeNull();
  });
});
