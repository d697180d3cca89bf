import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });


afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const harbour = { id: "3a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d", name: "Harbour Marine Services" };
const ridge = { id: "4b2c3d4e-5f6a-4b7c-9d8e-0f1a2b3c4d5e", name: "Ridge Cabins Ltd" };

const job = (n: number, extra: Record<string, unknown> = {}) => ({
  id: `6c3d4e5f-6a7b-4c8d-9e0f-${String(n).padStart(12, "0")}`,
  title: `Job ${n}`,
  status: "lead",
  siteAddress: null,
  client: harbour,
  systemCount: 0,
  worstStatus: null,
  createdAt: "2026-10-01T09:00:00.000Z",
  updatedAt: "2026-11-20T09:00:00.000Z",
  ...extra,
});

const cabin = job(1, { title: "Cabin battery bank", status: "won", siteAddress: "12 Lake Road", client: ridge, systemCount: 2, worstStatus: "over" });
const dock = job(2, { title: "Dock lighting cabin side", status: "won", systemCount: 1, worstStatus: "near" });
const shed = job(3, { title: "Cabin shed", status: "won", systemCount: 1, worstStatus: null });

const page = (items: unknown[], extra: { total?: number; page?: number } = {}) => ({
  body: { items, total: extra.total ?? items.length, page: extra.page ?? 1, pageSize: 25 },
});

const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp });
const jobsUrl = (query: string) => `GET /api/jobs?${query}`;

describe("the Jobs list", () => {
  it("reads its filters from the address and sends them to the API, in a fixed order", async () => {
    const api = stubApi({
      ...base(),
      [jobsUrl("page=2&pageSize=25&sort=-updatedAt&search=cabin&status=won")]: page([cabin, dock, shed], { total: 53, page: 2 }),
    });
    renderAt("/jobs?status=won&search=cabin&page=2");
    const table = await screen.findByRole("table", { name: "Jobs" });
    expect(api.unexpected).toEqual([]);
    expect(api.callsTo(jobsUrl("page=2&pageSize=25&sort=-updatedAt&search=cabin&status=won"))).toHaveLength(1);

    expect((screen.getByRole("searchbox", { name: "Search jobs" }) as HTMLInputElement).value).toBe("cabin");
    expect((screen.getByLabelText("Status") as HTMLSelectElement).value).toBe("won");
    expect(screen.getByText("Page 2 of 3")).toBeTruthy();
    expect(screen.getByText("53 jobs")).toBeTruthy();

    expect(within(table).getAllByRole("columnheader").map((th) => th.textContent)).toEqual(["Title", "Client", "Site", "Status", "Systems", "Load check", "Updated"]);
    const cabinRow = within(table).getByRole("row", { name: /Cabin battery bank/ });
    expect(within(cabinRow).getByRole("link", { name: "Cabin battery bank" }).getAttribute("href")).toBe(`/jobs/${cabin.id}`);
    expect(cabinRow.textContent).toContain("Ridge Cabins Ltd");
    expect(cabinRow.textContent).toContain("12 Lake Road");
    expect(cabinRow.textContent).toContain("Won");
    expect(cabinRow.textContent).toContain("Over limit");
    expect(within(table).getByRole("row", { name: /Dock lighting/ }).textContent).toContain("Near limit");
    expect(within(table).getByRole("row", { name: /Cabin shed/ }).textContent).toContain("Not solved");
    // Default sort: newest change first, shown on the Updated header.
    expect(within(table).getByRole("columnheader", { name: /Updated/ }).getAttribute("aria-sort")).toBe("descending");
  });

  it("changes the address and refetches when the status filter, a header or the page changes", async () => {
    const api = stubApi({
      ...base(),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([cabin, dock, shed], { total: 30 }),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt&status=quoted")]: page([job(4, { title: "Quoted telecom shelter", status: "quoted" })], { total: 30 }),
      [jobsUrl("page=1&pageSize=25&sort=title&status=quoted")]: page([job(4, { title: "Quoted telecom shelter", status: "quoted" })], { total: 30 }),
      [jobsUrl("page=2&pageSize=25&sort=title&status=quoted")]: page([job(5, { title: "Second page job", status: "quoted" })], { total: 30, page: 2 }),
    });
    const router = renderAt("/jobs");
    await screen.findByRole("link", { name: "Cabin battery bank" });

    const status = screen.getByLabelText("Status") as HTMLSelectElement;
    expect([...status.options].map((o) => o.textContent)).toEqual(["All statuses", "Lead", "Quoted", "Won", "Lost", "Installed"]);
    fireEvent.change(status, { target: { value: "quoted" } });
    await waitFor(() => expect(router.state.location.search).toBe("?status=quoted"));
    expect(await screen.findByRole("link", { name: "Quoted telecom shelter" })).toBeTruthy();

    const titleHeader = screen.getByRole("columnheader", { name: /Title/ });
    expect(titleHeader.getAttribute("aria-sort")).toBe("none");
    fireEvent.click(within(titleHeader).getByRole("button", { name: "Title" }));
    await waitFor(() => expect(new URLSearchParams(router.state.location.search).get("sort")).toBe("title"));
    await waitFor(() => expect(screen.getByRole("columnheader", { name: /Title/ }).getAttribute("aria-sort")).toBe("ascending"));

    fireEvent.click(screen.getByRole("button", { name: "Next" }));
    expect(await screen.findByRole("link", { name: "Second page job" })).toBeTruthy();
    expect(new URLSearchParams(router.state.location.search).get("page")).toBe("2");
    expect(screen.getByText("Page 2 of 2")).toBeTruthy();
    expect((screen.getByRole("button", { name: "Next" }) as HTMLButtonElement).disabled).toBe(true);
    expect(api.unexpected).toEqual([]);
  });

  it("waits for a pause in typing before it searches, then starts again at page 1", async () => {
    const api = stubApi({
      ...base(),
      [jobsUrl("page=3&pageSize=25&sort=-updatedAt")]: page([cabin], { total: 60, page: 3 }),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt&search=well+pump")]: page([job(6, { title: "Well pump feeder" })]),
    });
    const router = renderAt("/jobs?page=3");
    await screen.findByRole("link", { name: "Cabin battery bank" });
    const search = screen.getByRole("searchbox", { name: "Search jobs" });
    for (const text of ["w", "we", "well", "well p", "well pump "]) fireEvent.change(search, { target: { value: text } });
    expect(await screen.findByRole("link", { name: "Well pump feeder" })).toBeTruthy();
    expect(new URLSearchParams(router.state.location.search).get("search")).toBe("well pump");
    expect(new URLSearchParams(router.state.location.search).get("page")).toBeNull();
    // One request for the whole word, none for the letters typed on the way.
    expect(api.calls.filter((c) => c.url.includes("search="))).toHaveLength(1);
    expect(api.unexpected).toEqual([]);
  });

  it("shows an empty state when the company has no jobs, and a different one when filters match nothing", async () => {
    stubApi({
      ...base(),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([]),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt&status=lost")]: page([]),
    });
    const router = renderAt("/jobs");
    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
    expect(screen.queryByRole("table")).toBeNull();

    fireEvent.change(screen.getByLabelText("Status"), { target: { value: "lost" } });
    expect(await screen.findByText(/No jobs match these filters/)).toBeTruthy();
    expect(screen.queryByRole("heading", { name: "No jobs yet" })).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Clear the filters" }));
    await waitFor(() => expect(router.state.location.search).toBe(""));
    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
  });

  it("says when the jobs could not be loaded, and tries again", async () => {
    let fail = true;
    const api = stubApi({
      ...base(),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: () => (fail ? apiError(503, "service_unavailable", "The database is not answering") : page([cabin])),
    });
    renderAt("/jobs");
    expect((await screen.findByRole("alert")).textContent).toContain("The database is not answering");
    fail = false;
    fireEvent.click(screen.getByRole("button", { name: "Try again" }));
    expect(await screen.findByRole("link", { name: "Cabin battery bank" })).toBeTruthy();
    expect(api.callsTo(jobsUrl("page=1&pageSize=25&sort=-updatedAt"))).toHaveLength(2);
  });

  it("gives an Installer no New job button", async () => {
    stubApi({ ...base("installer"), [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([cabin]) });
    renderAt("/jobs");
    await screen.findByRole("link", { name: "Cabin battery bank" });
    expect(screen.queryByRole("button", { name: "New job" })).toBeNull();
  });
});

describe("the New job form", () => {
  const clientsUrl = "GET /api/clients?page=1&pageSize=100&sort=name";
  const client = (c: { id: string; name: string }) => ({
    ...c,
    email: null,
    phone: null,
    billingAddress: null,
    notes: null,
    jobCount: 1,
    createdAt: "2026-10-01T09:00:00.000Z",
    updatedAt: "2026-10-01T09:00:00.000Z",
  });

  it("checks the form before sending, then puts the server's field error beside its field", async () => {
    const api = stubApi({
      ...base("owner"),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([cabin]),
      [clientsUrl]: page([client(ridge), client(harbour)]),
      "POST /api/jobs": apiError(400, "invalid_input", "site address must be at most 500 characters", {
        fields: { siteAddress: "site address must be at most 500 characters" },
      }),
    });
    renderAt("/jobs");
    fireEvent.click(await screen.findByRole("button", { name: "New job" }));
    const dialog = screen.getByRole("dialog", { name: "New job" });
    const clientSelect = (await within(dialog).findByRole("combobox", { name: "Client" })) as HTMLSelectElement;
    await waitFor(() => expect(clientSelect.disabled).toBe(false));
    expect([...clientSelect.options].map((o) => o.textContent)).toEqual(["Choose a client", "Harbour Marine Services", "Ridge Cabins Ltd"]);
    expect((within(dialog).getByLabelText("Status") as HTMLSelectElement).value).toBe("lead");

    fireEvent.click(within(dialog).getByRole("button", { name: "Create job" }));
    await waitFor(() => expect(clientSelect.getAttribute("aria-invalid")).toBe("true"));
    expect(dialog.textContent).toContain("Choose a client");
    expect(dialog.textContent).toContain("title is required");
    expect(api.callsTo("POST /api/jobs")).toHaveLength(0);

    fireEvent.change(clientSelect, { target: { value: ridge.id } });
    fireEvent.change(within(dialog).getByLabelText("Title"), { target: { value: "  Boathouse lights  " } });
    fireEvent.change(within(dialog).getByLabelText("Site address"), { target: { value: "Pier 4" } });
    fireEvent.change(within(dialog).getByLabelText("Status"), { target: { value: "quoted" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create job" }));

    const site = within(dialog).getByLabelText("Site address");
    await waitFor(() => expect(site.getAttribute("aria-invalid")).toBe("true"));
    const errorId = site.getAttribute("aria-describedby")?.split(" ")[0] ?? "";
    expect(document.getElementById(errorId)?.textContent).toContain("site address must be at most 500 characters");
    expect(api.callsTo("POST /api/jobs").map((c) => c.body)).toEqual([{ clientId: ridge.id, title: "Boathouse lights", siteAddress: "Pier 4", status: "quoted", notes: null }]);
    expect(screen.getByRole("dialog", { name: "New job" })).toBeTruthy();
  });

  it("creates the job and opens its page", async () => {
    const created = {
      ...job(9, { title: "Boathouse lights", client: ridge }),
      notes: null,
      createdBy: { id: sessionAs("owner").body.user.id, name: "Ada Quill" },
      systems: [],
      attachments: [],
    };
    const api = stubApi({
      ...base("owner"),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([cabin]),
      [clientsUrl]: page([client(ridge)]),
      "POST /api/jobs": { status: 201, body: created },
      // The job page lists the job's quotes and their payments.
      [`GET /api/jobs/${created.id}/quotes`]: { body: { items: [] } },
      [`GET /api/jobs/${created.id}/payments`]: { body: { items: [] } },
    });
    const router = renderAt("/jobs");
    fireEvent.click(await screen.findByRole("button", { name: "New job" }));
    const dialog = screen.getByRole("dialog", { name: "New job" });
    const clientSelect = (await within(dialog).findByRole("combobox", { name: "Client" })) as HTMLSelectElement;
    await waitFor(() => expect(clientSelect.options.length).toBe(2));
    fireEvent.change(clientSelect, { target: { value: ridge.id } });
    fireEvent.change(within(dialog).getByLabelText("Title"), { target: { value: "Boathouse lights" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create job" }));
    await waitFor(() => expect(router.state.location.pathname).toBe(`/jobs/${created.id}`));
    expect(await screen.findByRole("heading", { level: 1, name: "Boathouse lights" })).toBeTruthy();
    // The job page starts from the answer to the POST: no second request for it.
    expect(api.callsTo(`GET /api/jobs/${created.id}`)).toHaveLength(0);
    expect(api.unexpected).toEqual([]);
  });

  it("adds a client from inside the form and chooses it", async () => {
    const fresh = client({ id: "7d4e5f6a-7b8c-4d9e-8f0a-1b2c3d4e5f6a", name: "Alder Farm" });
    let clients = [client(ridge)];
    const api = stubApi({
      ...base("estimator"),
      [jobsUrl("page=1&pageSize=25&sort=-updatedAt")]: page([cabin]),
      [clientsUrl]: () => page(clients),
      "POST /api/clients": (call) => {
        clients = [fresh, ...clients];
        return { status: 201, body: { ...fresh, name: (call.body as { name: string }).name } };
      },
    });
    renderAt("/jobs");
    fireEvent.click(await screen.findByRole("button", { name: "New job" }));
    const dialog = screen.getByRole("dialog", { name: "New job" });
    fireEvent.click(await within(dialog).findByRole("button", { name: "Add a new client" }));
    fireEvent.change(within(dialog).getByLabelText("Client name"), { target: { value: "Alder Farm" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Add client" }));
    const clientSelect = within(dialog).getByRole("combobox", { name: "Client" }) as HTMLSelectElement;
    await waitFor(() => expect(clientSelect.value).toBe(fresh.id));
    expect(api.callsTo("POST /api/clients").map((c) => c.body)).toEqual([{ name: "Alder Farm", email: null }]);
    expect(api.callsTo("POST /api/jobs")).toHaveLength(0);
  });
});
