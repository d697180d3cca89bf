import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { QuoteDetail } from "../../shared/schemas/estimates";
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
