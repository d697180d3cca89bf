import { act, cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { CSRF_HEADER } from "../../shared/http";
import { apiError, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });

/** Stands in for XMLHttpRequest (uploads): records the request and answers when the test says. */
class FakeXhr {
  static instances: FakeXhr[] = [];
  method = "";
  url = "";
  headers: Record<string, string> = {};
  withCredentials = false;
  responseType = "";
  status = 0;
  responseText = "";
  body: unknown = null;
  readonly upload = new EventTarget();
  private readonly events = new EventTarget();
  constructor() {
    FakeXhr.instances.push(this);
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  addEventListener(type: string, listener: EventListener) {
    this.events.addEventListener(type, listener);
  }
  send(body: unknown) {
    this.body = body;
  }
  abort() {
    this.events.dispatchEvent(new Event("abort"));
  }
  progress(loaded: number, total: number) {
    this.upload.dispatchEvent(Object.assign(new Event("progress"), { lengthComputable: true, loaded, total }));
  }
  respond(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.events.dispatchEvent(new Event("load"));
  }
}

beforeEach(() => {
  FakeXhr.instances = [];
  vi.stubGlobal("XMLHttpRequest", FakeXhr);
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const JOB_ID = "6c3d4e5f-6a7b-4c8d-9e0f-000000000001";
const ridge = { id: "4b2c3d4e-5f6a-4b7c-9d8e-0f1a2b3c4d5e", name: "Ridge Cabins Ltd" };
const system = (id: string, name: string, lastSolve: unknown, extra: Record<string, unknown> = {}) => ({
  id,
  name,
  nominalVoltage: 24,
  units: "metric",
  limitProfileId: null,
  loadCount: 4,
  runCount: 5,
  lastSolve,
  version: 3,
  updatedAt: "2026-11-21T09:00:00.000Z",
  ...extra,
});
const houseBank = system("8e5f6a7b-8c9d-4e0f-9a1b-2c3d4e5f6a7b", "House bank", { worstStatus: "over", worstDropPercent: 6.24, over: 1, near: 2, within: 1, errors: 0 });
const pumpHouse = system("9f6a7b8c-9d0e-4f1a-8b2c-3d4e5f6a7b8c", "Pump house", null, { nominalVoltage: 48, units: "imperial", loadCount: 1, runCount: 1 });
const shed = system("0a7b8c9d-0e1f-4a2b-9c3d-4e5f6a7b8c9d", "Shed lights", { worstStatus: null, worstDropPercent: null, over: 0, near: 0, within: 0, errors: 2 });

const attachment = (id: string, fileName: string, mediaType: string, sizeBytes: number) => ({
  id,
  jobId: JOB_ID,
  fileName,
  mediaType,
  sizeBytes,
  uploadedBy: { id: "0b6f3c1e-8a47-4d2b-9e15-7c3a5f8d1e22", name: "Ada Quill" },
  createdAt: "2026-11-19T09:00:00.000Z",
  url: `/api/attachments/${id}/file`,
});
const roofPhoto = attachment("1b8c9d0e-1f2a-4b3c-8d4e-5f6a7b8c9d0e", "roof-east.jpg", "image/jpeg", 2_457_600);
const plan = attachment("2c9d0e1f-2a3b-4c4d-9e5f-6a7b8c9d0e1f", "site-plan.pdf", "application/pdf", 184_320);

const detail = (extra: Record<string, unknown> = {}) => ({
  id: JOB_ID,
  title: "Cabin battery bank",
  status: "quoted",
  siteAddress: "12 Lake Road, North Fork",
  client: ridge,
  systemCount: 3,
  worstStatus: "over",
  createdAt: "2026-10-01T09:00:00.000Z",
  updatedAt: "2026-11-21T09:00:00.000Z",
  notes: "Gate code 4411",
  createdBy: { id: "0b6f3c1e-8a47-4d2b-9e15-7c3a5f8d1e22", name: "Ada Quill" },
  systems: [houseBank, pumpHouse, shed],
  attachments: [roofPhoto, plan],
  ...extra,
});

const JOB = `GET /api/jobs/${JOB_ID}`;
const QUOTES = `GET /api/jobs/${JOB_ID}/quotes`;
const PAYMENTS = `GET /api/jobs/${JOB_ID}/payments`;
const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({
  "GET /api/auth/session": sessionAs(role),
  "GET /api/health": healthUp,
  [QUOTES]: { body: { items: [] } },
  [PAYMENTS]: { body: { items: [] } },
});

const systemsList = () => screen.getByRole("list", { name: "Systems" });
const attachmentsList = () => screen.getByRole("list", { name: "Attachments" });

describe("the Job page", () => {
  it("shows the job, its systems with their last solve, its photos and plans, and no quotes or payments yet", async () => {
    const api = stubApi({ ...base(), [JOB]: { body: detail() } });
    renderAt(`/jobs/${JOB_ID}`);
    expect(await screen.findByRole("heading", { level: 1, name: "Cabin battery bank" })).toBeTruthy();
    const main = screen.getByRole("main");
    expect(main.textContent).toContain("Ridge Cabins Ltd");
    expect(main.textContent).toContain("12 Lake Road, North Fork");
    expect(main.textContent).toContain("Ada Quill");
    expect((screen.getByLabelText("Job status") as HTMLSelectElement).value).toBe("quoted");
    expect((screen.getByLabelText("Notes") as HTMLTextAreaElement).value).toBe("Gate code 4411");

    const cards = within(systemsList()).getAllByRole("listitem");
    expect(cards).toHaveLength(3);
    const [house, pump, lights] = cards;
    expect(within(house).getByRole("link", { name: "House bank" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/systems/${houseBank.id}`);
    expect(house.textContent).toContain("24 V");
    expect(house.textContent).toContain("Metric");
    expect(house.textContent).toContain("Over limit");
    expect(house.textContent).toContain("Worst drop 6.2 %");
    expect(house.textContent).toContain("1 over · 2 near · 1 within");
    expect(pump.textContent).toContain("48 V");
    expect(pump.textContent).toContain("Imperial");
    expect(pump.textContent).toContain("Not solved");
    expect(lights.textContent).toContain("Could not be solved: 2 problems to fix");
    // Results are on this page, so are the cautions (DESIGN.md §5).
    const cautions = screen.getByRole("region", { name: "Safety cautions" });
    expect(cautions.textContent).toMatch(/fault/);

    const files = within(attachmentsList()).getAllByRole("listitem");
    expect(files).toHaveLength(2);
    const img = within(files[0]).getByRole("img", { name: "roof-east.jpg" });
    expect(img.getAttribute("src")).toBe(roofPhoto.url);
    expect(img.getAttribute("loading")).toBe("lazy");
    expect(files[0].textContent).toContain("2.3 MB");
    expect(within(files[0]).getByRole("link", { name: "Download" }).getAttribute("href")).toBe(`${roofPhoto.url}?download=1`);
    expect(within(files[1]).queryByRole("img")).toBeNull();
    expect(files[1].textContent).toContain("site-plan.pdf");
    expect(files[1].textContent).toContain("180 KB");

    const quotes = screen.getByRole("region", { name: "Quotes" });
    await waitFor(() => expect(quotes.textContent).toContain("No quotes yet"));
    expect(within(quotes).getByRole("link", { name: "Estimate" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/estimate`);
    expect(within(quotes).queryByRole("link", { name: "Cut list PDF" })).toBeNull();
    const payments = screen.getByRole("region", { name: "Payments" });
    await waitFor(() => expect(payments.textContent).toContain("No payments yet."));
    expect(within(payments).queryByRole("table")).toBeNull();
    expect(api.callsTo(PAYMENTS)).toHaveLength(1);
    expect(api.unexpected).toEqual([]);
  });

  it("saves a new status as soon as it is chosen, and the notes on Save notes", async () => {
    let current = detail();
    const api = stubApi({
      ...base(),
      [JOB]: () => ({ body: current }),
      [`PATCH /api/jobs/${JOB_ID}`]: (call) => {
        current = { ...current, ...(call.body as object) };
        return { body: current };
      },
    });
    renderAt(`/jobs/${JOB_ID}`);
    fireEvent.change(await screen.findByLabelText("Job status"), { target: { value: "won" } });
    await waitFor(() => expect(api.callsTo(`PATCH /api/jobs/${JOB_ID}`).map((c) => c.body)).toEqual([{ status: "won" }]));
    await waitFor(() => expect((screen.getByLabelText("Job status") as HTMLSelectElement).value).toBe("won"));

    expect(screen.queryByRole("button", { name: "Save notes" })).toBeNull();
    fireEvent.change(screen.getByLabelText("Notes"), { target: { value: "Gate code 4411. Dog on site." } });
    fireEvent.click(screen.getByRole("button", { name: "Save notes" }));
    expect(await screen.findByRole("status", { name: "Notes saved" })).toBeTruthy();
    expect(api.callsTo(`PATCH /api/jobs/${JOB_ID}`)[1].body).toEqual({ notes: "Gate code 4411. Dog on site." });
  });

  it("uploads a chosen file with XMLHttpRequest, showing its progress, then lists it", async () => {
    const fresh = attachment("3d0e1f2a-3b4c-4d5e-8f6a-7b8c9d0e1f2a", "panel.png", "image/png", 51_200);
    let uploaded = false;
    const api = stubApi({ ...base(), [JOB]: () => ({ body: detail(uploaded ? { attachments: [fresh, roofPhoto, plan] } : {}) }) });
    renderAt(`/jobs/${JOB_ID}`);
    const input = (await screen.findByLabelText("Add files")) as HTMLInputElement;
    expect(input.type).toBe("file");
    expect(input.multiple).toBe(true);
    expect(input.accept).toBe("image/jpeg,image/png,application/pdf");

    const file = new File([new Uint8Array(51_200)], "panel.png", { type: "image/png" });
    fireEvent.change(input, { target: { files: [file] } });
    expect(FakeXhr.instances).toHaveLength(1);
    const xhr = FakeXhr.instances[0];
    expect(xhr.method).toBe("POST");
    expect(xhr.url).toBe(`/api/jobs/${JOB_ID}/attachments`);
    expect(xhr.withCredentials).toBe(true);
    expect(xhr.headers[CSRF_HEADER]).toBe("1");
    expect(xhr.body).toBeInstanceOf(FormData);
    expect(((xhr.body as FormData).get("file") as File).name).toBe("panel.png");

    const bar = screen.getByRole("progressbar", { name: "Uploading panel.png" }) as HTMLProgressElement;
    expect(bar.value).toBe(0);
    act(() => xhr.progress(25_600, 51_400));
    expect(bar.value).toBe(50);

    uploaded = true;
    act(() => xhr.respond(201, fresh));
    await waitFor(() => expect(within(attachmentsList()).getAllByRole("listitem")).toHaveLength(3));
    expect(within(attachmentsList()).getByRole("img", { name: "panel.png" })).toBeTruthy();
    expect(screen.queryByRole("progressbar", { name: "Uploading panel.png" })).toBeNull();
    expect(api.callsTo(JOB)).toHaveLength(2);
  });

  it("highlights the drop zone while files are dragged over it and uploads the dropped ones", async () => {
    stubApi({ ...base(), [JOB]: { body: detail() } });
    renderAt(`/jobs/${JOB_ID}`);
    const zone = (await screen.findByText(/Drop files here or/)).closest("[data-dragging], div") as HTMLElement;
    const drawing = new File(["%PDF-1.7"], "single-line.pdf", { type: "application/pdf" });
    fireEvent.dragEnter(zone, { dataTransfer: { types: ["Files"], files: [] } });
    expect(zone.getAttribute("data-dragging")).toBe("true");
    expect(zone.textContent).toContain("Release to add these files");
    fireEvent.drop(zone, { dataTransfer: { types: ["Files"], files: [drawing] } });
    expect(zone.getAttribute("data-dragging")).toBeNull();
    expect(FakeXhr.instances).toHaveLength(1);
    expect(((FakeXhr.instances[0].body as FormData).get("file") as File).name).toBe("single-line.pdf");
    expect(screen.getByRole("progressbar", { name: "Uploading single-line.pdf" })).toBeTruthy();
  });

  it("shows the server's reason beside a refused file", async () => {
    stubApi({ ...base(), [JOB]: { body: detail() } });
    renderAt(`/jobs/${JOB_ID}`);
    const input = await screen.findByLabelText("Add files");
    fireEvent.change(input, { target: { files: [new File(["not really"], "renamed.png", { type: "image/png" })] } });
    act(() => FakeXhr.instances[0].respond(415, { error: { code: "unsupported_media_type", message: "Only JPEG, PNG or PDF files can be attached" } }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("renamed.png was not added. Only JPEG, PNG or PDF files can be attached");
    fireEvent.click(screen.getByRole("button", { name: "Dismiss renamed.png" }));
    expect(screen.queryByRole("alert")).toBeNull();
  });

  it("refuses a file over 10 MB, or of another type, before sending anything", async () => {
    stubApi({ ...base(), [JOB]: { body: detail() } });
    renderAt(`/jobs/${JOB_ID}`);
    const input = await screen.findByLabelText("Add files");
    const big = new File([new Uint8Array(10 * 1024 * 1024 + 1)], "drone-survey.jpg", { type: "image/jpeg" });
    const doc = new File(["x"], "notes.docx", { type: "application/vnd.openxmlformats-officedocument.wordprocessingml.document" });
    fireEvent.change(input, { target: { files: [big, doc] } });
    const alerts = await screen.findAllByRole("alert");
    expect(alerts.map((a) => a.textContent)).toEqual([
      "✕drone-survey.jpg was not added. This file is larger than 10 MB, the most one attachment can be.",
      "✕notes.docx was not added. This file type cannot be attached: only JPEG, PNG or PDF files.",
    ]);
    expect(FakeXhr.instances).toHaveLength(0);
  });

  it("asks before deleting an attachment, then removes it", async () => {
    let deleted = false;
    const api = stubApi({
      ...base(),
      [JOB]: () => ({ body: detail(deleted ? { attachments: [plan] } : {}) }),
      [`DELETE /api/attachments/${roofPhoto.id}`]: () => {
        deleted = true;
        return { status: 204 };
      },
    });
    renderAt(`/jobs/${JOB_ID}`);
    await screen.findByRole("heading", { level: 1, name: "Cabin battery bank" });
    const photo = within(attachmentsList()).getAllByRole("listitem")[0];
    fireEvent.click(within(photo).getByRole("button", { name: "Delete" }));
    const dialog = screen.getByRole("dialog", { name: "Delete roof-east.jpg?" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Delete" }));
    await waitFor(() => expect(within(attachmentsList()).getAllByRole("listitem")).toHaveLength(1));
    expect(api.callsTo(`DELETE /api/attachments/${roofPhoto.id}`)).toHaveLength(1);
  });

  it("starts a new system from the form and opens its editor", async () => {
    const profile = {
      id: "4e1f2a3b-4c5d-4e6f-9a7b-8c9d0e1f2a3b",
      name: "Marine 3 %",
      branchPercent: 3,
      totalPercent: 3,
      criticalPercent: 3,
      nearFraction: 0.8,
      notes: null,
      builtIn: false,
      systemCount: 0,
      updatedAt: "2026-11-01T09:00:00.000Z",
    };
    const created = { id: "5f2a3b4c-5d6e-4f7a-8b8c-9d0e1f2a3b4c", jobId: JOB_ID, name: "Boathouse", nominalVoltage: 36, units: "imperial", limitProfileId: profile.id, document: {}, version: 1, updatedAt: "2026-12-01T09:00:00.000Z", updatedBy: null };
    const api = stubApi({
      ...base(),
      [JOB]: { body: detail({ systems: [] }) },
      "GET /api/limit-profiles?page=1&pageSize=100&sort=name": { body: { items: [profile], total: 1, page: 1, pageSize: 100 } },
      [`POST /api/jobs/${JOB_ID}/systems`]: { status: 201, body: created },
    });
    const router = renderAt(`/jobs/${JOB_ID}`);
    expect(await screen.findByText(/No systems yet/)).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "New system" }));
    const dialog = screen.getByRole("dialog", { name: "New system" });
    expect(document.activeElement).toBe(within(dialog).getByLabelText("System name"));
    const profiles = within(dialog).getByLabelText("Limit profile") as HTMLSelectElement;
    await waitFor(() => expect(profiles.options).toHaveLength(2));

    fireEvent.change(within(dialog).getByLabelText("Nominal voltage"), { target: { value: "other" } });
    fireEvent.change(within(dialog).getByLabelText("Other nominal voltage (V)"), { target: { value: "thirty" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create system" }));
    await waitFor(() => expect(within(dialog).getByLabelText("System name").getAttribute("aria-invalid")).toBe("true"));
    expect(dialog.textContent).toContain("nominal voltage must be a number of volts");
    expect(api.callsTo(`POST /api/jobs/${JOB_ID}/systems`)).toHaveLength(0);

    fireEvent.change(within(dialog).getByLabelText("System name"), { target: { value: "Boathouse" } });
    fireEvent.change(within(dialog).getByLabelText("Other nominal voltage (V)"), { target: { value: "36" } });
    fireEvent.change(within(dialog).getByLabelText("Units"), { target: { value: "imperial" } });
    fireEvent.change(profiles, { target: { value: profile.id } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create system" }));
    // The editor is another screen, loaded on demand: where the router is going, or has arrived.
    await waitFor(() => expect((router.state.navigation.location ?? router.state.location).pathname).toBe(`/jobs/${JOB_ID}/systems/${created.id}`));
    expect(api.callsTo(`POST /api/jobs/${JOB_ID}/systems`).map((c) => c.body)).toEqual([
      { name: "Boathouse", nominalVoltage: 36, units: "imperial", limitProfileId: profile.id },
    ]);
  });

  it("deletes the job after asking, and goes back to Jobs", async () => {
    const api = stubApi({
      ...base("owner"),
      [JOB]: { body: detail() },
      [`DELETE /api/jobs/${JOB_ID}`]: { status: 204 },
      "GET /api/jobs?page=1&pageSize=25&sort=-updatedAt": { body: { items: [], total: 0, page: 1, pageSize: 25 } },
    });
    const router = renderAt(`/jobs/${JOB_ID}`);
    fireEvent.click(await screen.findByRole("button", { name: "Delete job" }));
    const dialog = screen.getByRole("dialog", { name: "Delete Cabin battery bank?" });
    expect(dialog.textContent).toContain("Its 3 systems and 2 attachments are deleted with it.");
    fireEvent.click(within(dialog).getByRole("button", { name: "Delete job" }));
    await waitFor(() => expect(router.state.location.pathname).toBe("/jobs"));
    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
    expect(api.callsTo(`DELETE /api/jobs/${JOB_ID}`)).toHaveLength(1);
  });

  it("lists the job's quotes newest first with their status and total, and the cut list once one is accepted", async () => {
    const quote = (id: string, revision: number, status: string, extra: Record<string, unknown> = {}) => ({
      id,
      jobId: JOB_ID,
      jobTitle: "Cabin battery bank",
      clientName: "Ridge Cabins Ltd",
      number: "Q-2026-0042",
      revision,
      label: `Q-2026-0042 R${revision}`,
      status,
      superseded: false,
      currency: "USD",
      totalMinor: 482_350,
      depositMinor: 144_705,
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
      createdAt: "2026-11-20T09:00:00.000Z",
      ...extra,
    });
    const r2 = quote("7a1b2c3d-4e5f-4a6b-8c7d-000000000002", 2, "accepted", { sentAt: "2026-11-22T09:00:00.000Z", sentTo: "office@ridge.example", acceptedAt: "2026-11-23T09:00:00.000Z", linkActive: true });
    const r1 = quote("7a1b2c3d-4e5f-4a6b-8c7d-000000000001", 1, "draft", { superseded: true, totalMinor: 455_000, sendError: "Mailbox unavailable" });
    stubApi({ ...base(), [JOB]: { body: detail() }, [QUOTES]: { body: { items: [r2, r1] } } });
    renderAt(`/jobs/${JOB_ID}`);
    const quotes = await screen.findByRole("region", { name: "Quotes" });
    const rows = await within(quotes).findAllByRole("row");
    expect(rows).toHaveLength(3);
    expect(within(rows[1]).getByRole("link", { name: "Q-2026-0042 R2" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/quotes/${r2.id}`);
    expect(rows[1].textContent).toContain("Accepted");
    expect(rows[1].textContent).toContain("$4,823.50");
    expect(rows[1].textContent).toContain("office@ridge.example");
    expect(rows[2].textContent).toContain("Draft");
    expect(rows[2].textContent).toContain("Superseded");
    expect(rows[2].textContent).toContain("Not sent: the e-mail failed");
    expect(within(quotes).getByRole("link", { name: "Cut list PDF" }).getAttribute("href")).toBe(`/api/jobs/${JOB_ID}/cut-list.pdf`);
    expect(within(quotes).getByRole("link", { name: "Estimate" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/estimate`);
  });

  it("lists the payments of the job's quotes with their quote, status, amount, date and receipt", async () => {
    const R2 = "7a1b2c3d-4e5f-4a6b-8c7d-000000000002";
    const payment = (id: string, receiptNumber: string, extra: Record<string, unknown> = {}) => ({
      id,
      quoteId: R2,
      jobId: JOB_ID,
      quoteLabel: "Q-2026-0042 R2",
      receiptNumber,
      status: "paid",
      mismatchReason: null,
      amountMinor: 144_705,
      currency: "USD",
      expectedAmountMinor: 144_705,
      expectedCurrency: "USD",
      refundedMinor: 0,
      paidAt: "2026-11-24T10:00:00.000Z",
      payerName: "Morgan Ridge",
      payerEmail: "morgan@ridge.example",
      receiptSentAt: "2026-11-24T10:01:00.000Z",
      receiptError: null,
      stripePaymentIntentId: "pi_3PqR5sT6uV7wX8yZ",
      refunds: [],
      ...extra,
    });
    const deposit = payment("9b1c2d3e-4f5a-4b6c-8d7e-000000000003", "R-2026-0007", { status: "partially refunded", refundedMinor: 20_000 });
    const odd = payment("9b1c2d3e-4f5a-4b6c-8d7e-000000000004", "R-2026-0008", { status: "mismatch", mismatchReason: "Paid in EUR; the deposit was due in USD", amountMinor: 130_000, currency: "EUR", paidAt: "2026-11-25T10:00:00.000Z" });
    const api = stubApi({ ...base(), [JOB]: { body: detail() }, [PAYMENTS]: { body: { items: [deposit, odd] } } });
    renderAt(`/jobs/${JOB_ID}`);
    const payments = await screen.findByRole("region", { name: "Payments" });
    const table = await within(payments).findByRole("table", { name: "Payments of this job, with their receipts" });
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(3);
    expect(within(rows[1]).getByRole("link", { name: "Q-2026-0042 R2" }).getAttribute("href")).toBe(`/jobs/${JOB_ID}/quotes/${R2}`);
    expect(rows[1].textContent).toContain("Partly refunded");
    expect(rows[1].textContent).toContain("$1,447.05");
    expect(rows[1].textContent).toContain("$200.00 refunded");
    expect(rows[1].textContent).toContain(new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric" }).format(new Date("2026-11-24T10:00:00.000Z")));
    expect(within(rows[1]).getByRole("link", { name: "Receipt R-2026-0007 (PDF)" }).getAttribute("href")).toBe(`/api/payments/${deposit.id}/receipt.pdf`);
    expect(rows[2].textContent).toContain("Check this payment");
    expect(rows[2].textContent).toContain("Paid in EUR; the deposit was due in USD");
    expect(rows[2].textContent).toContain("€1,300.00");
    expect(within(rows[2]).getByRole("link", { name: "Receipt R-2026-0008 (PDF)" }).getAttribute("href")).toBe(`/api/payments/${odd.id}/receipt.pdf`);
    expect(payments.textContent).not.toContain("No payments yet");
    expect(api.unexpected).toEqual([]);
  });

  it("says when the payments could not be loaded, and tries again", async () => {
    let down = true;
    const api = stubApi({ ...base(), [JOB]: { body: detail() }, [PAYMENTS]: () => (down ? apiError(503, "service_unavailable", "The database is not answering.") : { body: { items: [] } }) });
    renderAt(`/jobs/${JOB_ID}`);
    const payments = await screen.findByRole("region", { name: "Payments" });
    expect((await within(payments).findByRole("alert")).textContent).toContain("The payments could not be loaded. The database is not answering.");
    down = false;
    fireEvent.click(within(payments).getByRole("button", { name: "Try again" }));
    await waitFor(() => expect(payments.textContent).toContain("No payments yet."));
    expect(api.callsTo(PAYMENTS)).toHaveLength(2);
  });

  it("answers an unknown job with Job not found and a way back", async () => {
    stubApi({ ...base(), [JOB]: apiError(404, "not_found", "Job not found") });
    renderAt(`/jobs/${JOB_ID}`);
    expect(await screen.findByRole("heading", { name: "Job not found" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "Back to jobs" }).getAttribute("href")).toBe("/jobs");
  });

  it("gives an Installer the job read-only: no status select, no uploads, no delete, no new system", async () => {
    stubApi({ ...base("installer"), [JOB]: { body: detail() } });
    renderAt(`/jobs/${JOB_ID}`);
    await screen.findByRole("heading", { level: 1, name: "Cabin battery bank" });
    expect(screen.queryByLabelText("Job status")).toBeNull();
    expect(screen.getByRole("main").textContent).toContain("Quoted");
    expect(screen.queryByRole("textbox", { name: "Notes" })).toBeNull();
    expect(screen.getByText("Gate code 4411")).toBeTruthy();
    expect(screen.queryByLabelText("Add files")).toBeNull();
    expect(screen.queryByRole("button", { name: "New system" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Delete job" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Edit details" })).toBeNull();
    expect(within(attachmentsList()).queryAllByRole("button", { name: "Delete" })).toHaveLength(0);
    expect(within(attachmentsList()).getAllByRole("link", { name: "Download" })).toHaveLength(2);
  });
});
