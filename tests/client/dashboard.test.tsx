import { cleanup, configure, fireEvent, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const JOB_ID = "6c3d4e5f-6a7b-4c8d-9e0f-000000000001";
const OTHER_JOB_ID = "6c3d4e5f-6a7b-4c8d-9e0f-000000000002";
const SYSTEM_ID = "8e5f6a7b-8c9d-4e0f-9a1b-2c3d4e5f6a7b";
const DASHBOARD = "GET /api/dashboard";

const summary = (id: string, label: string, extra: Record<string, unknown> = {}) => ({
  id,
  jobId: JOB_ID,
  jobTitle: "Cabin battery bank",
  clientName: "Ridge Cabins Ltd",
  number: label.split(" ")[0],
  revision: 1,
  label,
  status: "sent",
  superseded: false,
  currency: "USD",
  totalMinor: 482_350,
  depositMinor: 144_705,
  validUntil: "2026-12-31",
  sentAt: "2026-11-12T09:00:00.000Z",
  sentTo: "office@ridge.example",
  sentBy: "Ada Quill",
  sendError: null,
  sendPendingSince: null,
  viewedAt: null,
  acceptedAt: null,
  acceptedName: null,
  declinedAt: null,
  declineReason: null,
  linkActive: true,
  createdAt: "2026-11-12T09:00:00.000Z",
  ...extra,
});

const QUOTE_A = "7a1b2c3d-4e5f-4a6b-8c7d-00000000000a";
const QUOTE_B = "7a1b2c3d-4e5f-4a6b-8c7d-00000000000b";

const full = {
  currency: "USD",
  month: "2026-12",
  byStatus: [
    { status: "draft", count: 2, totalMinor: 310_000 },
    { status: "sent", count: 3, totalMinor: 1_250_075 },
    { status: "accepted", count: 1, totalMinor: 482_350 },
    { status: "deposit paid", count: 1, totalMinor: 96_000 },
  ],
  awaiting: [
    summary(QUOTE_A, "Q-2026-0042 R2"),
    summary(QUOTE_B, "Q-2026-0038 R1", { jobId: OTHER_JOB_ID, jobTitle: "Boathouse lighting", clientName: "Harbour Sail Club", status: "viewed", totalMinor: 128_900 }),
  ],
  activity: [
    { quoteId: QUOTE_A, label: "Q-2026-0042 R2", jobId: JOB_ID, jobTitle: "Cabin battery bank", clientName: "Ridge Cabins Ltd", type: "viewed", at: "2026-12-01T15:30:00.000Z", actor: null },
    { quoteId: QUOTE_B, label: "Q-2026-0038 R1", jobId: OTHER_JOB_ID, jobTitle: "Boathouse lighting", clientName: "Harbour Sail Club", type: "accepted", at: "2026-12-01T11:00:00.000Z", actor: "Sam Harbour" },
  ],
  overLimitSystems: [{ systemId: SYSTEM_ID, systemName: "House bank", jobId: JOB_ID, jobTitle: "Cabin battery bank", over: 2 }],
  deposits: { receivedThisMonth: { count: 1, amountMinor: 28_800, refundedMinor: 0 }, outstanding: { count: 1, amountMinor: 144_705 }, flagged: [] as unknown[] },
};

const noDeposits = { receivedThisMonth: { count: 0, amountMinor: 0, refundedMinor: 0 }, outstanding: { count: 0, amountMinor: 0 }, flagged: [] };

const PAYMENT_ID = "9b1c2d3e-4f5a-4b6c-8d7e-000000000004";
const flaggedPayment = {
  id: PAYMENT_ID,
  quoteId: QUOTE_B,
  jobId: OTHER_JOB_ID,
  quoteLabel: "Q-2026-0038 R1",
  receiptNumber: "R-2026-0008",
  status: "mismatch",
  mismatchReason: "Paid $120.00; the deposit due was $386.70",
  amountMinor: 12_000,
  currency: "USD",
  expectedAmountMinor: 38_670,
  expectedCurrency: "USD",
  refundedMinor: 0,
  paidAt: "2026-12-03T09:30:00.000Z",
  payerName: "Sam Harbour",
  payerEmail: null,
  receiptSentAt: null,
  receiptError: null,
  stripePaymentIntentId: "pi_3PqR5sT6uV7wX8yZ",
  refunds: [],
};

const base = () => ({ "GET /api/auth/session": sessionAs("estimator"), "GET /api/health": healthUp });

describe("the Dashboard", () => {
  it("shows this month's quotes by status, the money by status, what waits for an answer, recent activity and systems over limit", async () => {
    const api = stubApi({ ...base(), [DASHBOARD]: { body: full } });
    renderAt("/");
    const tiles = await screen.findByRole("list", { name: "Quotes this month by status" });
    const items = within(tiles).getAllByRole("listitem");
    expect(items.map((li) => li.textContent)).toEqual([
      "Draft2 quotes$3,100.00",
      "Sent3 quotes$12,500.75",
      "Viewed0 quotes$0.00",
      "Accepted1 quote$4,823.50",
      "Declined0 quotes$0.00",
      "Expired0 quotes$0.00",
      "Deposit paid1 quote$960.00",
    ]);
    expect(screen.getByRole("heading", { name: /Quotes in December 2026/ })).toBeTruthy();
    // The chart's figures, also as a table (jsdom lays nothing out, so the bars are not drawn here).
    const chart = screen.getByRole("table", { name: "Money by status this month" });
    expect(within(chart).getByText("Sent").closest("tr")?.textContent).toBe("Sent3$12,500.75");

    const awaiting = screen.getByRole("list", { name: "Waiting for an answer" });
    const waiting = within(awaiting).getAllByRole("listitem");
    expect(waiting).toHaveLength(2);
    expect(within(waiting[0]).getByRole("link", { name: "Q-2026-0042 R2" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/quotes/${QUOTE_A}`);
    expect(waiting[0].textContent).toContain("Ridge Cabins Ltd");
    expect(waiting[0].textContent).toContain("$4,823.50");
    expect(waiting[0].textContent).toMatch(/\d+ days ago/);
    expect(within(waiting[1]).getByRole("link", { name: "Q-2026-0038 R1" }).getAttribute("href")).toBe(`/jobs/${OTHER_JOB_ID}/quotes/${QUOTE_B}`);
    expect(waiting[1].textContent).toContain("Viewed");

    const activity = screen.getByRole("list", { name: "Recent activity" });
    const events = within(activity).getAllByRole("listitem");
    expect(events[0].textContent).toContain("Opened by the client");
    expect(events[0].textContent).toContain("Ridge Cabins Ltd");
    expect(within(events[0]).getByRole("link", { name: "Cabin battery bank" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}`);
    expect(events[1].textContent).toContain("Accepted by the client");
    expect(events[1].textContent).toContain("Sam Harbour");
    expect(within(events[1]).getByRole("link", { name: "Q-2026-0038 R1" }).getAttribute("href")).toBe(`/jobs/${OTHER_JOB_ID}/quotes/${QUOTE_B}`);

    const over = screen.getByRole("list", { name: "Systems with loads over the limit" });
    expect(within(over).getByRole("link", { name: "House bank" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/systems/${SYSTEM_ID}`);
    expect(over.textContent).toContain("2 loads over limit");
    expect(api.unexpected).toEqual([]);
  });

  it("says there is nothing to follow up when the company has no quotes and no systems over limit", async () => {
    stubApi({
      ...base(),
      [DASHBOARD]: { body: { currency: "USD", month: "2026-12", byStatus: [{ status: "draft", count: 0, totalMinor: 0 }], awaiting: [], activity: [], overLimitSystems: [], deposits: noDeposits } },
    });
    renderAt("/");
    expect(await screen.findByRole("heading", { name: "Nothing to follow up yet" })).toBeTruthy();
    expect(screen.queryByRole("list", { name: "Quotes this month by status" })).toBeNull();
    expect(screen.queryByRole("list", { name: "Deposits" })).toBeNull();
  });

  it("shows the deposits received this month with what was refunded, the deposits outstanding and the payments to check", async () => {
    const api = stubApi({
      ...base(),
      [DASHBOARD]: {
        body: {
          ...full,
          activity: [
            { quoteId: QUOTE_B, label: "Q-2026-0038 R1", jobId: OTHER_JOB_ID, jobTitle: "Boathouse lighting", clientName: "Harbour Sail Club", type: "payment_flagged", at: "2026-12-03T09:30:00.000Z", actor: null },
            { quoteId: QUOTE_A, label: "Q-2026-0042 R2", jobId: JOB_ID, jobTitle: "Cabin battery bank", clientName: "Ridge Cabins Ltd", type: "deposit_paid", at: "2026-12-02T09:30:00.000Z", actor: null },
            { quoteId: QUOTE_A, label: "Q-2026-0042 R2", jobId: JOB_ID, jobTitle: "Cabin battery bank", clientName: "Ridge Cabins Ltd", type: "refunded", at: "2026-12-02T12:00:00.000Z", actor: "Ada Quill" },
          ],
          deposits: {
            receivedThisMonth: { count: 3, amountMinor: 333_405, refundedMinor: 10_000 },
            outstanding: { count: 2, amountMinor: 183_375 },
            flagged: [flaggedPayment],
          },
        },
      },
    });
    renderAt("/");
    const tiles = await screen.findByRole("list", { name: "Deposits" });
    const [received, outstanding] = within(tiles).getAllByRole("listitem");
    expect(within(received).getByRole("heading", { name: "Deposits received this month" })).toBeTruthy();
    expect(received.textContent).toBe("Deposits received this month3 deposits$3,334.05$100.00 refunded");
    expect(within(outstanding).getByRole("heading", { name: "Deposits outstanding" })).toBeTruthy();
    expect(outstanding.textContent).toBe("Deposits outstanding2 deposits$1,833.75Accepted quotes waiting for their deposit");

    const toCheck = screen.getByRole("list", { name: "Payments to check" });
    const items = within(toCheck).getAllByRole("listitem");
    expect(items).toHaveLength(1);
    expect(within(items[0]).getByRole("link", { name: "Q-2026-0038 R1" }).getAttribute("href")).toBe(`/jobs/${OTHER_JOB_ID}/quotes/${QUOTE_B}`);
    expect(items[0].textContent).toContain("$120.00");
    expect(items[0].textContent).toContain("Paid $120.00; the deposit due was $386.70");
    expect(items[0].textContent).toContain("R-2026-0008");

    const events = within(screen.getByRole("list", { name: "Recent activity" })).getAllByRole("listitem");
    expect(events.map((e) => e.querySelector("span")?.textContent)).toEqual(["Payment flagged", "Deposit paid", "Refunded"]);
    expect(api.unexpected).toEqual([]);
  });

  it("leaves out the refunded amount when nothing was refunded, and the list of payments to check when there is none", async () => {
    stubApi({ ...base(), [DASHBOARD]: { body: full } });
    renderAt("/");
    const tiles = await screen.findByRole("list", { name: "Deposits" });
    const [received, outstanding] = within(tiles).getAllByRole("listitem");
    expect(received.textContent).toBe("Deposits received this month1 deposit$288.00");
    expect(outstanding.textContent).toContain("1 deposit$1,447.05");
    expect(screen.queryByRole("list", { name: "Payments to check" })).toBeNull();
    expect(screen.queryByText("Payments to check")).toBeNull();
  });

  it("is not empty when the only news is a payment to check", async () => {
    stubApi({
      ...base(),
      [DASHBOARD]: { body: { currency: "USD", month: "2026-12", byStatus: [], awaiting: [], activity: [], overLimitSystems: [], deposits: { ...noDeposits, flagged: [flaggedPayment] } } },
    });
    renderAt("/");
    const toCheck = await screen.findByRole("list", { name: "Payments to check" });
    expect(within(toCheck).getByRole("link", { name: "Q-2026-0038 R1" })).toBeTruthy();
    expect(screen.queryByRole("heading", { name: "Nothing to follow up yet" })).toBeNull();
  });

  it("says when the dashboard could not be loaded, and tries again", async () => {
    let down = true;
    const api = stubApi({ ...base(), [DASHBOARD]: () => (down ? apiError(503, "service_unavailable", "The database is not answering.") : { body: full }) });
    renderAt("/");
    expect((await screen.findByRole("alert")).textContent).toContain("The dashboard could not be loaded. The database is not answering.");
    down = false;
    fireEvent.click(screen.getByRole("button", { name: "Try again" }));
    expect(await screen.findByRole("list", { name: "Quotes this month by status" })).toBeTruthy();
    expect(api.callsTo(DASHBOARD)).toHaveLength(2);
  });
});
