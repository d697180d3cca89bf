import { act, cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { CAUTIONS } from "../../shared/engine/cautions";
import { CSRF_HEADER } from "../../shared/http";
import { PublicQuoteSchema, type PublicQuote } from "../../shared/schemas/estimates";
import { apiError, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// The screen's module is transformed once here, not inside the first test's wait for its heading.
beforeAll(async () => {
  await import("../../src/app/routes/quote-link");
}, 60_000);

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

// A link token of the shape the server issues: `<uuid>.<43 base64url characters>`.
const TOKEN = `7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f.${"Wp3_-".repeat(8)}Wp3`;
const GET = `GET /api/quote-links/${TOKEN}`;
const ACCEPT = `POST /api/quote-links/${TOKEN}/accept`;
const DECLINE = `POST /api/quote-links/${TOKEN}/decline`;

const HOSTILE = "<img src=x onerror=alert(1)>";
const EXTRA_CAUTION = "Pump motor inrush: check the fuse's time-current curve against the pump's starting current.";

// Money: subtotal 868.43 + 25.29 + 526.50 = 1420.22; discount 50.00; tax 8.25 % of 1370.22 = 113.04; total 1483.26; deposit 30 % = 444.98.
function quoteFixture(overrides: { company?: Partial<PublicQuote["snapshot"]["company"]>; clientName?: string; deposit?: Partial<PublicQuote["deposit"]> } = {}): PublicQuote {
  return PublicQuoteSchema.parse({
    state: "open",
    status: "viewed",
    label: "Q-2026-0042 R2",
    acceptedName: null,
    acceptedAt: null,
    declinedAt: null,
    // An open quote's deposit is due (on acceptance); the page offers it only once accepted.
    deposit: { state: "due", dueMinor: 44498, currency: "USD", online: true, paidMinor: null, paidAt: null, receiptNumber: null, ...overrides.deposit },
    snapshot: {
      company: {
        name: "Kestrel Bay DC Works",
        licenceNumber: "EC-20417",
        contactEmail: "office@kestrel.example",
        phone: "+1 (555) 010-2244",
        address: "14 Wharf Road\nKestrel Bay",
        logo: { mediaType: "image/png", base64: "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR4nGNgYGD4DwABBAEAwS2OUAAAAABJRU5ErkJggg==" },
        ...overrides.company,
      },
      client: { name: overrides.clientName ?? "Mara Lindqvist", email: "mara@example.net", phone: null, billingAddress: "3 Fern Street" },
      job: { id: "0e9d8c7b-6a5f-4e3d-9c2b-1a0f9e8d7c6b", title: "Cabin off-grid power", siteAddress: "Lot 7, Ridge Lane" },
      currency: "USD",
      number: "Q-2026-0042",
      revision: 2,
      issuedAt: "2026-03-12T15:00:00.000Z",
      validUntil: "2026-04-11",
      terms: "Deposit due on acceptance.\nBalance due on completion.",
      scope: ["Run a feeder from the battery bank to the well pump", "Light the shed and the porch"],
      lines: [
        line("cable-16", "cable", "Twin cable 16 mm² copper", 88, "m", 731, 64328, 35, 86843),
        line("fuse-150", "fuse", "Fuse 150 A with holder", 1, "each", 1873, 1873, 35, 2529),
        line("labour", "labour", "Installation labour", 6.5, "hour", 6000, 39000, 35, 52650),
      ],
      totals: {
        costMinor: 105201,
        subtotalMinor: 142022,
        discountMinor: 5000,
        taxableMinor: 137022,
        taxRatePercent: 8.25,
        taxMinor: 11304,
        totalMinor: 148326,
        depositMinor: 44498,
        marginMinor: 36821,
      },
      systems: [
        {
          id: "sys-1",
          name: "Cabin 24 V",
          nominalVoltage: 24,
          units: "metric",
          limitProfile: { name: "Standard", branchPercent: 3, totalPercent: 5, criticalPercent: 2 },
          solved: true,
          caseNames: ["Full charge", "Low battery, hot day"],
          points: [
            { id: "p1", name: "Battery bus" },
            { id: "p2", name: "Pump disconnect" },
            { id: "p3", name: "Shed lights" },
          ],
          loads: [
            { id: "l1", name: "Well pump", worstCase: "Low battery, hot day", voltage: 23.41, dropPercent: 2.46, limitPercent: 3, status: "within" },
            { id: "l2", name: "Shed lights", worstCase: "Low battery, hot day", voltage: 23.3, dropPercent: 2.9, limitPercent: 3, status: "near" },
            { id: "l3", name: "Porch light", worstCase: "Low battery, hot day", voltage: 23.1, dropPercent: 3.75, limitPercent: 3, status: "over" },
          ],
          runs: [
            { id: "r1", name: "Pump feeder", from: "p1", to: "p2", size: "16 mm2", returnSize: null, material: "copper", length: 40, parallel: 1, fuseA: 150, maxCurrentA: 42.5, ampacityA: 80 },
            { id: "r2", name: "Shed branch", from: "p1", to: "p3", size: "4 mm2", returnSize: null, material: "copper", length: 22.5, parallel: 2, fuseA: 30, maxCurrentA: 12, ampacityA: 32 },
          ],
          findings: [],
          document: {},
        },
      ],
      cautions: [...CAUTIONS, EXTRA_CAUTION],
      wastePercent: 10,
    },
  });
}

function line(key: string, category: string, description: string, quantity: number, unit: string, unitCostMinor: number, costMinor: number, markupPercent: number, sellMinor: number) {
  return { key, source: "layout", category, description, detail: "2 conductors × 40 m × 1 set + 10 % waste", sku: `SKU-${key}`, quantity, unit, unitCostMinor, markupPercent, costMinor, sellMinor, overridden: false };
}

const dateOf = (iso: string) => new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric" }).format(new Date(iso));

/** The text of everything an input's aria-describedby points at (its error and hint). */
function descriptionOf(input: HTMLElement): string {
  const ids = input.getAttribute("aria-describedby")?.split(" ") ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent ?? "").join(" ");
}

/** The first wait of a test covers the lazy screen and the stubbed fetch on a busy machine. */
const FIRST_PAINT = { timeout: 5000 };

const openQuote = () => screen.findByRole("heading", { level: 1, name: "Quote Q-2026-0042 R2" }, FIRST_PAINT);

describe("the client's quote page", { timeout: 20_000 }, () => {
  it("shows the company, the prices, the voltage drop per load and the cautions, with no session call", async () => {
    const api = stubApi({ [GET]: { body: quoteFixture() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    expect(screen.getByText("Kestrel Bay DC Works")).toBeTruthy();
    expect(screen.getByText("Licence no. EC-20417")).toBeTruthy();
    expect(screen.getByRole("img", { name: "Kestrel Bay DC Works logo" }).getAttribute("src")).toMatch(/^data:image\/png;base64,iVBORw0KGgo/);
    expect(screen.getAllByRole("link", { name: "office@kestrel.example" })[0]!.getAttribute("href")).toBe("mailto:office@kestrel.example");
    expect(screen.getAllByRole("link", { name: "+1 (555) 010-2244" })[0]!.getAttribute("href")).toBe("tel:+15550102244");
    expect(screen.getByText("Mara Lindqvist")).toBeTruthy();
    expect(screen.getByText("Lot 7, Ridge Lane")).toBeTruthy();
    expect(screen.getByText(dateOf("2026-03-12T15:00:00.000Z"))).toBeTruthy();
    expect(screen.getByRole("link", { name: "Download PDF" }).getAttribute("href")).toBe(`/api/quote-links/${TOKEN}/pdf`);

    // Prices grouped by category; the client sees quantities and sell amounts only.
    const prices = screen.getByRole("region", { name: "Prices" });
    for (const heading of ["Cable", "Fuses and holders", "Labour"]) expect(within(prices).getByRole("columnheader", { name: heading })).toBeTruthy();
    expect(within(prices).getByRole("row", { name: /Twin cable 16 mm² copper/ }).textContent).toContain("$868.43");
    expect(within(prices).getByRole("row", { name: /Installation labour/ }).textContent).toContain("6.5 hours");
    expect(within(prices).getByRole("row", { name: /^Discount/ }).textContent).toContain("−$50.00");
    expect(within(prices).getByRole("row", { name: /^Tax \(8\.25 %\)/ }).textContent).toContain("$113.04");
    expect(within(prices).getByRole("row", { name: /^Total/ }).textContent).toContain("$1,483.26");
    expect(within(prices).getByRole("row", { name: /^Deposit due on acceptance/ }).textContent).toContain("$444.98");
    const page = document.body.textContent ?? "";
    for (const hidden of ["$643.28", "$7.31", "$1,052.01", "$368.21", "SKU-cable-16", "markup", "Markup", "2 conductors ×"]) expect(page).not.toContain(hidden);

    // Each load's status in words, in its own row.
    const drop = screen.getByRole("region", { name: "Voltage drop" });
    expect(within(drop).getByRole("row", { name: /Well pump/ }).textContent).toContain("Within limit");
    expect(within(drop).getByRole("row", { name: /^Shed lights/ }).textContent).toContain("Near limit");
    const porch = within(drop).getByRole("row", { name: /Porch light/ });
    expect(porch.textContent).toContain("Over limit");
    expect(porch.textContent).toContain("23.10 V");
    expect(porch.textContent).toContain("3.75 %");
    const feeder = within(drop).getByRole("row", { name: /Pump feeder/ });
    expect(feeder.textContent).toContain("16 mm²");
    expect(feeder.textContent).toContain("Battery bus → Pump disconnect");
    expect(feeder.textContent).toContain("40 m");
    expect(feeder.textContent).toContain("42.5 A");
    expect(within(drop).getByRole("row", { name: /Shed branch/ }).textContent).toContain("2 × 4 mm²");
    expect(drop.textContent).not.toContain("mm2");

    const cautions = screen.getByRole("region", { name: "Safety cautions" });
    expect(cautions.textContent).toContain(EXTRA_CAUTION);
    expect(cautions.textContent).toContain("Battery banks can deliver thousands of amperes into a fault");

    expect(screen.getByRole("region", { name: "Terms" }).textContent).toContain("Balance due on completion.");
    // Not accepted yet: the deposit is only the line in the totals.
    expect(screen.queryByRole("region", { name: "Deposit due" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
    expect(api.calls.map((c) => `${c.method} ${c.url}`)).toEqual([GET]);
  });

  it("shows a loading state until the quote arrives", async () => {
    let answer: (response: Response) => void = () => {};
    vi.stubGlobal("fetch", vi.fn(() => new Promise<Response>((resolve) => (answer = resolve))));
    renderAt(`/q/${TOKEN}`);
    expect((await screen.findByRole("status", {}, FIRST_PAINT)).textContent).toBe("Loading your quote…");
    answer(new Response(JSON.stringify(quoteFixture()), { status: 200, headers: { "Content-Type": "application/json" } }));
    await openQuote();
    expect(screen.queryByText("Loading your quote…")).toBeNull();
  });

  it("offers to try again when the quote cannot be fetched, and shows it when it can", async () => {
    let tries = 0;
    stubApi({ [GET]: () => (++tries === 1 ? "network-error" : { body: quoteFixture() }) });
    renderAt(`/q/${TOKEN}`);
    expect((await screen.findByRole("alert", {}, FIRST_PAINT)).textContent).toContain("The server could not be reached");
    fireEvent.click(screen.getByRole("button", { name: "Try again" }));
    await openQuote();
    expect(tries).toBe(2);
  });

  it("renders a hostile company or client name as text", async () => {
    stubApi({ [GET]: { body: quoteFixture({ company: { name: HOSTILE, logo: null }, clientName: HOSTILE }) } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    expect(screen.getAllByText(HOSTILE).length).toBeGreaterThanOrEqual(2);
    expect(document.querySelectorAll("img")).toHaveLength(0);
    expect(document.querySelector("[onerror]")).toBeNull();
  });
});

describe("accepting", { timeout: 20_000 }, () => {
  const accepted = () => ({ ...quoteFixture(), state: "accepted", status: "accepted", acceptedName: "Mara Lindqvist", acceptedAt: "2026-03-14T16:30:00.000Z" });

  it("will not send without the name and the ticked box, and says so beside each field", async () => {
    const api = stubApi({ [GET]: { body: quoteFixture() }, [ACCEPT]: { body: accepted() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    fireEvent.click(screen.getByRole("button", { name: "Accept quote" }));
    const name = screen.getByLabelText("Your full name");
    const agree = screen.getByLabelText("I have read and agree to the terms above");
    await waitFor(() => expect(name.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(name)).toContain("name is required");
    expect(agree.getAttribute("aria-invalid")).toBe("true");
    expect(descriptionOf(agree)).toContain("tick the box to agree to the terms");

    // A name alone is not enough: the box stays in error, the name's error goes.
    fireEvent.change(name, { target: { value: "Mara Lindqvist" } });
    fireEvent.click(screen.getByRole("button", { name: "Accept quote" }));
    await waitFor(() => expect(name.getAttribute("aria-invalid")).toBe("false"));
    expect(descriptionOf(name)).toBe("");
    expect(agree.getAttribute("aria-invalid")).toBe("true");
    expect(descriptionOf(agree)).toContain("tick the box to agree to the terms");
    expect((screen.getByRole("button", { name: "Accept quote" }) as HTMLButtonElement).disabled).toBe(false);

    expect(api.callsTo(ACCEPT)).toHaveLength(0);
    expect(api.unexpected).toEqual([]);
  });

  it("sends the name and the agreement, then shows who accepted and when", async () => {
    const api = stubApi({ [GET]: { body: quoteFixture() }, [ACCEPT]: { body: accepted() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    fireEvent.change(screen.getByLabelText("Your full name"), { target: { value: "  Mara Lindqvist " } });
    fireEvent.click(screen.getByLabelText("I have read and agree to the terms above"));
    fireEvent.click(screen.getByRole("button", { name: "Accept quote" }));

    const heading = await screen.findByRole("heading", { level: 2, name: `Accepted by Mara Lindqvist on ${dateOf("2026-03-14T16:30:00.000Z")}` });
    expect(document.activeElement).toBe(heading);
    expect(heading.closest("section")?.textContent).toContain(
      "Pay the deposit of $444.98 below, and Kestrel Bay DC Works will be in touch to arrange the work.",
    );
    // The answer carries the deposit: its panel is there at once, with no reload.
    const deposit = screen.getByRole("region", { name: "Deposit due" });
    expect(deposit.textContent).toContain("$444.98");
    expect(within(deposit).getByRole("button", { name: "Pay deposit" })).toBeTruthy();
    expect(api.callsTo(GET)).toHaveLength(1);
    expect(screen.queryByRole("button", { name: "Accept quote" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Decline quote" })).toBeNull();
    expect(api.callsTo(ACCEPT).map((c) => c.body)).toEqual([{ name: "Mara Lindqvist", agree: true }]);
    // apiRequest's CSRF header goes with the POST.
    expect(api.callsTo(ACCEPT)[0]!.headers.get(CSRF_HEADER)).toBe("1");
  });

  it("opens an accepted quote in its accepted state", async () => {
    stubApi({ [GET]: { body: accepted() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    expect(screen.getByRole("heading", { level: 2, name: /^Accepted by Mara Lindqvist on / })).toBeTruthy();
    expect(screen.queryByLabelText("Your full name")).toBeNull();
  });

  it("puts the server's field error beside its field and any other failure in the form", async () => {
    let reply: ReturnType<typeof apiError> | "network-error" = apiError(400, "invalid_input", "name contains a control character", { fields: { name: "name contains a control character" } });
    stubApi({ [GET]: { body: quoteFixture() }, [ACCEPT]: () => reply });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    fireEvent.change(screen.getByLabelText("Your full name"), { target: { value: "Mara Lindqvist" } });
    fireEvent.click(screen.getByLabelText("I have read and agree to the terms above"));
    fireEvent.click(screen.getByRole("button", { name: "Accept quote" }));
    const name = screen.getByLabelText("Your full name");
    await waitFor(() => expect(name.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(name)).toContain("name contains a control character");
    expect(screen.queryByRole("alert")).toBeNull();

    reply = "network-error";
    fireEvent.click(screen.getByRole("button", { name: "Accept quote" }));
    expect((await screen.findByRole("alert")).textContent).toContain("The server could not be reached");
    expect(screen.getByRole("button", { name: "Accept quote" })).toBeTruthy();
  });
});

describe("declining", { timeout: 20_000 }, () => {
  const declined = () => ({ ...quoteFixture(), state: "declined", status: "declined", declinedAt: "2026-03-15T12:00:00.000Z" });

  it("sends the reason typed and shows the declined state", async () => {
    const api = stubApi({ [GET]: { body: quoteFixture() }, [DECLINE]: { body: declined() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    expect(screen.queryByLabelText("Reason (optional)")).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Decline quote" }));
    const reason = screen.getByLabelText("Reason (optional)");
    await waitFor(() => expect(document.activeElement).toBe(reason));
    fireEvent.change(reason, { target: { value: " We are putting the cabin work off until spring. " } });
    fireEvent.click(screen.getByRole("button", { name: "Confirm decline" }));

    const heading = await screen.findByRole("heading", { level: 2, name: "You declined this quote" });
    expect(document.activeElement).toBe(heading);
    expect(screen.getByText(`Declined on ${dateOf("2026-03-15T12:00:00.000Z")}.`)).toBeTruthy();
    expect(api.callsTo(DECLINE).map((c) => c.body)).toEqual([{ reason: "We are putting the cabin work off until spring." }]);
    expect(api.callsTo(ACCEPT)).toHaveLength(0);
  });

  it("sends no reason when the box is left empty, and can be cancelled first", async () => {
    const api = stubApi({ [GET]: { body: quoteFixture() }, [DECLINE]: { body: declined() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    fireEvent.click(screen.getByRole("button", { name: "Decline quote" }));
    fireEvent.click(screen.getByRole("button", { name: "Cancel" }));
    expect(screen.queryByLabelText("Reason (optional)")).toBeNull();
    await waitFor(() => expect(document.activeElement).toBe(screen.getByRole("button", { name: "Decline quote" })));

    fireEvent.click(screen.getByRole("button", { name: "Decline quote" }));
    fireEvent.click(screen.getByRole("button", { name: "Confirm decline" }));
    expect(await screen.findByRole("heading", { level: 2, name: "You declined this quote" })).toBeTruthy();
    expect(api.callsTo(DECLINE).map((c) => c.body)).toEqual([{}]);
  });

  it("shows a server failure in the decline form", async () => {
    stubApi({ [GET]: { body: quoteFixture() }, [DECLINE]: apiError(500, "internal", "Something went wrong on our side") });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    fireEvent.click(screen.getByRole("button", { name: "Decline quote" }));
    fireEvent.click(screen.getByRole("button", { name: "Confirm decline" }));
    expect((await screen.findByRole("alert")).textContent).toContain("Something went wrong on our side");
    expect(screen.getByLabelText("Reason (optional)")).toBeTruthy();
  });
});

describe("a link that no longer works", { timeout: 20_000 }, () => {
  const contact = { companyName: "Kestrel Bay DC Works", contactEmail: "office@kestrel.example", phone: "+1 555 010 2244" };
  const cases = [
    { reason: "expired", status: 410, heading: "This quote has expired" },
    { reason: "revoked", status: 410, heading: "This link no longer works" },
    { reason: "superseded", status: 410, heading: "A newer version of this quote was sent to you", more: "Use the link in the latest e-mail" },
    { reason: "unknown", status: 404, heading: "We could not find this quote" },
  ] as const;

  it.each(cases)("says why ($reason) and how to reach the contractor", async ({ reason, status, heading, ...rest }) => {
    const api = stubApi({ [GET]: apiError(status, status === 410 ? "gone" : "not_found", "This link no longer opens a quote", { reason, ...contact }) });
    renderAt(`/q/${TOKEN}`);
    expect(await screen.findByRole("heading", { level: 1, name: heading }, FIRST_PAINT)).toBeTruthy();
    if ("more" in rest) expect(document.body.textContent).toContain(rest.more);
    expect(screen.getByRole("heading", { level: 2, name: "Contact Kestrel Bay DC Works" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "office@kestrel.example" }).getAttribute("href")).toBe("mailto:office@kestrel.example");
    expect(screen.getByRole("link", { name: "+1 555 010 2244" }).getAttribute("href")).toBe("tel:+15550102244");
    expect(screen.queryByRole("button", { name: "Accept quote" })).toBeNull();
    expect(api.calls.map((c) => `${c.method} ${c.url}`)).toEqual([GET]);
  });

  it("treats a 404 without details as unknown, with no contact links", async () => {
    stubApi({ [GET]: apiError(404, "not_found", "Not found") });
    renderAt(`/q/${TOKEN}`);
    expect(await screen.findByRole("heading", { level: 1, name: "We could not find this quote" }, FIRST_PAINT)).toBeTruthy();
    expect(screen.queryAllByRole("link")).toHaveLength(0);
  });

  it("renders a hostile company name on the closed page as text", async () => {
    stubApi({ [GET]: apiError(410, "gone", "Expired", { reason: "expired", companyName: HOSTILE, contactEmail: "office@kestrel.example", phone: null }) });
    renderAt(`/q/${TOKEN}`);
    expect(await screen.findByRole("heading", { level: 2, name: `Contact ${HOSTILE}` }, FIRST_PAINT)).toBeTruthy();
    expect(document.querySelectorAll("img")).toHaveLength(0);
  });
});

describe("the deposit", { timeout: 30_000 }, () => {
  const DEPOSIT = `POST /api/quote-links/${TOKEN}/deposit`;
  const CHECKOUT_URL = "https://checkout.stripe.com/c/pay/cs_test_a1B2c3D4e5F6g7H8#fidkdWxOYHwnPyd1blpxYHZxWjA0";
  const PAID_AT = "2026-03-14T17:05:00.000Z";
  const accepted = (deposit: Partial<PublicQuote["deposit"]> = {}, extra: Partial<PublicQuote> = {}): PublicQuote => ({
    ...quoteFixture({ deposit }),
    state: "accepted",
    status: "accepted",
    acceptedName: "Mara Lindqvist",
    acceptedAt: "2026-03-14T16:30:00.000Z",
    ...extra,
  });
  const paid = () => accepted({ state: "paid", paidMinor: 44498, paidAt: PAID_AT, receiptNumber: "R-2026-0007" }, { state: "deposit paid", status: "deposit paid" });

  /** window.location.assign, which the page calls with the payment page's address. */
  function stubAssign() {
    const assign = vi.fn();
    vi.stubGlobal("location", { ...window.location, assign });
    return assign;
  }

  it("offers the deposit of an accepted quote and goes to the payment page, busy until it is known", async () => {
    const assign = stubAssign();
    const api = stubApi({ [GET]: { body: accepted() }, [DEPOSIT]: { body: { url: CHECKOUT_URL } } });
    // Hold the POST until the test has seen the button busy.
    const stubbed = globalThis.fetch;
    let release: () => void = () => {};
    const gate = new Promise<void>((resolve) => (release = resolve));
    vi.stubGlobal("fetch", async (input: RequestInfo | URL, init?: RequestInit) => {
      if (init?.method === "POST") await gate;
      return stubbed(input, init);
    });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    const panel = screen.getByRole("region", { name: "Deposit due" });
    expect(panel.textContent).toContain("$444.98");
    fireEvent.click(within(panel).getByRole("button", { name: "Pay deposit" }));

    const busy = await within(panel).findByRole("button", { name: "Opening the payment page…" });
    expect((busy as HTMLButtonElement).disabled).toBe(true);
    expect(busy.getAttribute("aria-busy")).toBe("true");
    expect(assign).not.toHaveBeenCalled();

    release();
    await waitFor(() => expect(assign).toHaveBeenCalledWith(CHECKOUT_URL));
    expect(assign).toHaveBeenCalledTimes(1);
    expect(api.callsTo(DEPOSIT)).toHaveLength(1);
    expect(api.callsTo(DEPOSIT)[0]!.body).toBeUndefined();
    expect(api.callsTo(DEPOSIT)[0]!.headers.get(CSRF_HEADER)).toBe("1");
    // The browser is on its way: the button stays busy rather than inviting a second payment.
    expect(within(panel).getByRole("button", { name: "Opening the payment page…" })).toBeTruthy();
    expect(api.unexpected).toEqual([]);
  });

  it("shows the payment service's failure in an alert, and the button works again", async () => {
    const assign = stubAssign();
    const message = "We could not reach the payment service, and nothing was charged. Please try again in a few minutes.";
    const api = stubApi({ [GET]: { body: accepted() }, [DEPOSIT]: apiError(502, "payment_failed", message) });
    renderAt(`/q/${TOKEN}`);
    await openQuote();

    fireEvent.click(screen.getByRole("button", { name: "Pay deposit" }));
    const alert = await within(screen.getByRole("region", { name: "Deposit due" })).findByRole("alert");
    expect(alert.textContent).toBe(`✕${message}`);
    const button = screen.getByRole("button", { name: "Pay deposit" }) as HTMLButtonElement;
    expect(button.disabled).toBe(false);
    expect(button.getAttribute("aria-busy")).toBe("false");
    expect(assign).not.toHaveBeenCalled();
    expect(api.callsTo(DEPOSIT)).toHaveLength(1);
  });

  it("refuses to follow an address that is not a web page", async () => {
    const assign = stubAssign();
    stubApi({ [GET]: { body: accepted() }, [DEPOSIT]: { body: { url: "javascript:alert(1)" } } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    fireEvent.click(screen.getByRole("button", { name: "Pay deposit" }));
    expect((await screen.findByRole("alert")).textContent).toContain("The payment page's address was not understood");
    expect(assign).not.toHaveBeenCalled();
  });

  it("waits for the confirmation when the server says the payment is already being processed", async () => {
    const assign = stubAssign();
    const api = stubApi({
      [GET]: { body: accepted() },
      [DEPOSIT]: apiError(409, "conflict", "Your payment was received and is being confirmed; this page will show it in a moment", { state: "processing" }),
    });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    fireEvent.click(screen.getByRole("button", { name: "Pay deposit" }));
    expect(await screen.findByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();
    expect(screen.getByRole("heading", { level: 2, name: "Confirming your payment…" })).toBeTruthy();
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
    expect(screen.queryByRole("alert")).toBeNull();
    expect(assign).not.toHaveBeenCalled();
    // The conflict sends the page back to the server for the quote's state.
    await waitFor(() => expect(api.callsTo(GET).length).toBeGreaterThanOrEqual(2));
  });

  it("says nothing was charged when the client comes back without paying, and offers the button again", async () => {
    const api = stubApi({ [GET]: { body: accepted() } });
    renderAt(`/q/${TOKEN}?deposit=canceled`);
    await openQuote();
    const panel = screen.getByRole("region", { name: "Deposit due" });
    expect(within(panel).getByRole("status").textContent).toBe("Payment canceled — nothing was charged. You can pay the deposit whenever you are ready.");
    expect(within(panel).getByRole("button", { name: "Pay deposit" })).toBeTruthy();
    expect(screen.queryByRole("progressbar")).toBeNull();
    await waitFor(() => expect(document.activeElement).toBe(within(panel).getByRole("heading", { level: 2, name: "Deposit due" })));
    expect(api.callsTo(DEPOSIT)).toHaveLength(0);
  });

  it("confirms the payment after the client comes back, asking again every 2 s until the quote says paid", async () => {
    vi.useFakeTimers({ shouldAdvanceTime: true });
    try {
      let reads = 0;
      const api = stubApi({ [GET]: () => (++reads < 3 ? { body: accepted() } : { body: paid() }) });
      renderAt(`/q/${TOKEN}?deposit=returned&session_id=cs_test_a1B2c3D4e5F6g7H8`);
      await openQuote();

      expect(screen.getByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();
      expect(screen.getByRole("region", { name: "Confirming your payment…" }).textContent).toContain("$444.98");
      expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
      expect(reads).toBe(1);

      await act(async () => {
        await vi.advanceTimersByTimeAsync(2_000);
      });
      expect(reads).toBe(2);
      expect(screen.getByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();

      // The third read answers paid.
      await act(async () => {
        await vi.advanceTimersByTimeAsync(2_000);
      });
      const heading = await screen.findByRole("heading", { level: 2, name: "Deposit paid — thank you" });
      expect(screen.queryByRole("progressbar")).toBeNull();
      expect(reads).toBe(3);
      await waitFor(() => expect(document.activeElement).toBe(heading));

      // Paid: no more asking.
      await act(async () => {
        await vi.advanceTimersByTimeAsync(10_000);
      });
      expect(api.callsTo(GET)).toHaveLength(3);
    } finally {
      vi.useRealTimers();
    }
  });

  it("keeps the quote on screen and keeps asking when one read fails while the payment is confirmed", async () => {
    vi.useFakeTimers({ shouldAdvanceTime: true });
    try {
      let reads = 0;
      stubApi({ [GET]: () => (++reads === 2 ? "network-error" : reads < 3 ? { body: accepted() } : { body: paid() }) });
      renderAt(`/q/${TOKEN}?deposit=returned&session_id=cs_test_a1B2c3D4e5F6g7H8`);
      await openQuote();
      await act(async () => {
        await vi.advanceTimersByTimeAsync(2_000);
      });
      expect(reads).toBe(2);
      expect(screen.getByRole("heading", { level: 1, name: "Quote Q-2026-0042 R2" })).toBeTruthy();
      expect(screen.getByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();
      expect(screen.queryByText(/The quote could not be opened/)).toBeNull();
      await act(async () => {
        await vi.advanceTimersByTimeAsync(2_000);
      });
      expect(await screen.findByRole("heading", { level: 2, name: "Deposit paid — thank you" })).toBeTruthy();
    } finally {
      vi.useRealTimers();
    }
  });

  it("stops asking after a minute and says the receipt will follow by e-mail", async () => {
    // Fake clocks from the start, moving with real time so the screen's first paint needs no help.
    vi.useFakeTimers({ shouldAdvanceTime: true });
    try {
      const api = stubApi({ [GET]: { body: accepted() } });
      renderAt(`/q/${TOKEN}?deposit=returned&session_id=cs_test_a1B2c3D4e5F6g7H8`);
      await openQuote();
      expect(screen.getByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();

      await act(async () => {
        await vi.advanceTimersByTimeAsync(59_000);
      });
      expect(screen.getByRole("progressbar", { name: "Confirming your payment" })).toBeTruthy();
      const readsInAMinute = api.callsTo(GET).length;
      // One read on opening, then one every 2 s.
      expect(readsInAMinute).toBeGreaterThanOrEqual(25);

      await act(async () => {
        await vi.advanceTimersByTimeAsync(2_000);
      });
      expect(screen.queryByRole("progressbar")).toBeNull();
      expect(screen.getByRole("status").textContent).toBe("Your payment is being confirmed. You will receive a receipt by e-mail shortly.");
      expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
      const readsAtTheEnd = api.callsTo(GET).length;
      await act(async () => {
        await vi.advanceTimersByTimeAsync(10_000);
      });
      expect(api.callsTo(GET)).toHaveLength(readsAtTheEnd);
    } finally {
      vi.useRealTimers();
    }
  });

  it("shows the paid deposit with its receipt, to download or open", async () => {
    stubApi({ [GET]: { body: paid() } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    const panel = screen.getByRole("region", { name: "Deposit paid — thank you" });
    expect(panel.textContent).toContain("$444.98");
    expect(panel.textContent).toContain(dateOf(PAID_AT));
    expect(panel.textContent).toContain("R-2026-0007");
    const download = within(panel).getByRole("link", { name: "Download receipt (PDF)" });
    expect(download.getAttribute("href")).toBe(`/api/quote-links/${TOKEN}/receipt.pdf?download=1`);
    const open = within(panel).getByRole("link", { name: "Open receipt" });
    expect(open.getAttribute("href")).toBe(`/api/quote-links/${TOKEN}/receipt.pdf`);
    expect(open.getAttribute("target")).toBe("_blank");
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
    expect(screen.getByText("Accepted, deposit paid")).toBeTruthy();
    // Opened later, not just paid: the focus stays where the page starts.
    expect(document.activeElement).not.toBe(within(panel).getByRole("heading", { level: 2 }));
  });

  it("asks the client to contact the company when the deposit cannot be paid online", async () => {
    const api = stubApi({ [GET]: { body: accepted({ online: false }) } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    const panel = screen.getByRole("region", { name: "Deposit due" });
    expect(panel.textContent).toContain("$444.98");
    expect(panel.textContent).toContain("Please contact Kestrel Bay DC Works to pay it");
    expect(within(panel).getByRole("link", { name: "office@kestrel.example" }).getAttribute("href")).toBe("mailto:office@kestrel.example");
    expect(within(panel).getByRole("link", { name: "+1 (555) 010-2244" }).getAttribute("href")).toBe("tel:+15550102244");
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
    expect(api.callsTo(DEPOSIT)).toHaveLength(0);
  });

  it.each([
    { state: "review" as const, heading: "Your payment is being checked", text: "We received a payment that the contractor needs to check; they will be in touch." },
    { state: "refunded" as const, heading: "Your deposit was refunded", text: "The deposit of $444.98 paid on" },
  ])("shows a $state deposit in words, with no button", async ({ state, heading, text }) => {
    stubApi({ [GET]: { body: accepted({ state, paidMinor: state === "refunded" ? 44498 : null, paidAt: state === "refunded" ? PAID_AT : null }) } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    expect(screen.getByRole("region", { name: heading }).textContent).toContain(text);
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
    expect(screen.queryByRole("region", { name: "Deposit paid — thank you" })).toBeNull();
  });

  it("says nothing about a deposit when none is due", async () => {
    stubApi({ [GET]: { body: accepted({ state: "none", dueMinor: 0 }) } });
    renderAt(`/q/${TOKEN}`);
    await openQuote();
    expect(screen.queryByRole("region", { name: /Deposit|deposit|payment/ })).toBeNull();
    expect(screen.queryByRole("button", { name: "Pay deposit" })).toBeNull();
  });
});
