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

const client = (id: string, name: string, extra: Record<string, unknown> = {}) => ({
  id,
  name,
  email: null,
  phone: null,
  billingAddress: null,
  notes: null,
  jobCount: 0,
  createdAt: "2026-10-01T09:00:00.000Z",
  updatedAt: "2026-10-01T09:00:00.000Z",
  ...extra,
});
const harbour = client("3a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d", "Harbour Marine Services", { email: "ops@harbour.example", phone: "+1 555 0100", jobCount: 3 });
const ridge = client("4b2c3d4e-5f6a-4b7c-9d8e-0f1a2b3c4d5e", "Ridge Cabins Ltd");

const page = (items: unknown[], total = items.length) => ({ body: { items, total, page: 1, pageSize: 25 } });
const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp });
const LIST = "GET /api/clients?page=1&pageSize=25&sort=name";

describe("the Clients page", () => {
  it("lists clients with their jobs count, searches and sorts through the address", async () => {
    const api = stubApi({
      ...base(),
      [LIST]: page([harbour, ridge]),
      "GET /api/clients?page=1&pageSize=25&sort=-createdAt": page([ridge, harbour]),
      "GET /api/clients?page=1&pageSize=25&sort=-createdAt&search=ridge": page([ridge]),
    });
    const router = renderAt("/clients");
    const table = await screen.findByRole("table", { name: "Clients" });
    expect(within(table).getAllByRole("columnheader").map((th) => th.textContent)).toEqual(["Name", "E-mail", "Phone", "Jobs", "Added", "Actions"]);
    const row = within(table).getByRole("row", { name: /Harbour Marine/ });
    expect(row.textContent).toContain("ops@harbour.example");
    expect(row.textContent).toContain("+1 555 0100");
    expect(within(row).getByRole("link", { name: "3 jobs for Harbour Marine Services" }).getAttribute("href")).toBe(`/jobs?clientId=${harbour.id}`);
    expect(within(table).getByRole("columnheader", { name: /Name/ }).getAttribute("aria-sort")).toBe("ascending");

    fireEvent.click(within(table).getByRole("button", { name: "Added" }));
    await waitFor(() => expect(router.state.location.search).toBe("?sort=-createdAt"));
    await waitFor(() => expect(screen.getByRole("columnheader", { name: /Added/ }).getAttribute("aria-sort")).toBe("descending"));

    fireEvent.change(screen.getByRole("searchbox", { name: "Search clients" }), { target: { value: "ridge" } });
    await waitFor(() => expect(within(screen.getByRole("table", { name: "Clients" })).queryByText("Harbour Marine Services")).toBeNull());
    expect(new URLSearchParams(router.state.location.search).get("search")).toBe("ridge");
    expect(api.unexpected).toEqual([]);
  });

  it("shows an empty state with the New client button when there are none", async () => {
    stubApi({ ...base(), [LIST]: page([]) });
    renderAt("/clients");
    expect(await screen.findByRole("heading", { name: "No clients yet" })).toBeTruthy();
    expect(screen.getAllByRole("button", { name: "New client" })).toHaveLength(1);
    expect(screen.queryByRole("table")).toBeNull();
  });

  it("checks a new client before sending, puts server field errors on the field, then creates it", async () => {
    let created = false;
    let attempts = 0;
    const api = stubApi({
      ...base(),
      [LIST]: () => page(created ? [harbour, ridge, client("7d4e5f6a-7b8c-4d9e-8f0a-1b2c3d4e5f6a", "Alder Farm")] : [harbour, ridge]),
      "POST /api/clients": () => {
        attempts += 1;
        if (attempts === 1) return apiError(400, "invalid_input", "phone must be at most 40 characters", { fields: { phone: "phone must be at most 40 characters" } });
        created = true;
        return { status: 201, body: client("7d4e5f6a-7b8c-4d9e-8f0a-1b2c3d4e5f6a", "Alder Farm") };
      },
    });
    renderAt("/clients");
    fireEvent.click(await screen.findByRole("button", { name: "New client" }));
    const dialog = screen.getByRole("dialog", { name: "New client" });
    expect(document.activeElement).toBe(within(dialog).getByLabelText("Name"));

    fireEvent.change(within(dialog).getByLabelText("E-mail"), { target: { value: "not an address" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create client" }));
    await waitFor(() => expect(within(dialog).getByLabelText("Name").getAttribute("aria-invalid")).toBe("true"));
    expect(within(dialog).getByLabelText("E-mail").getAttribute("aria-invalid")).toBe("true");
    expect(dialog.textContent).toContain("name is required");
    expect(api.callsTo("POST /api/clients")).toHaveLength(0);

    fireEvent.change(within(dialog).getByLabelText("Name"), { target: { value: "Alder Farm" } });
    fireEvent.change(within(dialog).getByLabelText("E-mail"), { target: { value: "" } });
    fireEvent.change(within(dialog).getByLabelText("Phone"), { target: { value: "0123" } });
    fireEvent.change(within(dialog).getByLabelText("Billing address"), { target: { value: "Alder Lane 3\nNorth Fork" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create client" }));
    const phone = within(dialog).getByLabelText("Phone");
    await waitFor(() => expect(phone.getAttribute("aria-invalid")).toBe("true"));
    expect(document.getElementById(phone.getAttribute("aria-describedby")?.split(" ")[0] ?? "")?.textContent).toContain("phone must be at most 40 characters");

    fireEvent.click(within(dialog).getByRole("button", { name: "Create client" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(await screen.findByText("Alder Farm")).toBeTruthy();
    expect(api.callsTo("POST /api/clients")[1].body).toEqual({ name: "Alder Farm", email: null, phone: "0123", billingAddress: "Alder Lane 3\nNorth Fork", notes: null });
  });

  it("edits a client with its details filled in", async () => {
    const api = stubApi({
      ...base(),
      [LIST]: page([harbour, ridge]),
      [`PATCH /api/clients/${harbour.id}`]: (call) => ({ body: { ...harbour, ...(call.body as object) } }),
    });
    renderAt("/clients");
    const row = within(await screen.findByRole("table", { name: "Clients" })).getByRole("row", { name: /Harbour Marine/ });
    fireEvent.click(within(row).getByRole("button", { name: "Edit" }));
    const dialog = screen.getByRole("dialog", { name: "Edit Harbour Marine Services" });
    expect((within(dialog).getByLabelText("E-mail") as HTMLInputElement).value).toBe("ops@harbour.example");
    fireEvent.change(within(dialog).getByLabelText("Notes"), { target: { value: "Gate code 4411" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Save client" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(`PATCH /api/clients/${harbour.id}`).map((c) => c.body)).toEqual([
      { name: "Harbour Marine Services", email: "ops@harbour.example", phone: "+1 555 0100", billingAddress: null, notes: "Gate code 4411" },
    ]);
  });

  it("asks before deleting, and says plainly when the client still has jobs", async () => {
    const api = stubApi({
      ...base(),
      [LIST]: page([harbour, ridge]),
      [`DELETE /api/clients/${harbour.id}`]: apiError(409, "conflict", "This client still has 3 jobs"),
    });
    renderAt("/clients");
    const row = within(await screen.findByRole("table", { name: "Clients" })).getByRole("row", { name: /Harbour Marine/ });
    fireEvent.click(within(row).getByRole("button", { name: "Delete" }));
    const dialog = screen.getByRole("dialog", { name: "Delete Harbour Marine Services?" });
    expect(dialog.textContent).toContain("has 3 jobs");
    fireEvent.click(within(dialog).getByRole("button", { name: "Delete client" }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("Harbour Marine Services cannot be deleted: This client still has 3 jobs.");
    expect(alert.textContent).toContain("Move its jobs to another client or delete them first.");
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(api.callsTo(`DELETE /api/clients/${harbour.id}`)).toHaveLength(1);
    // Still listed.
    expect(within(screen.getByRole("table", { name: "Clients" })).getByText("Harbour Marine Services")).toBeTruthy();
  });

  it("shows an Installer the clients without New, Edit or Delete", async () => {
    stubApi({ ...base("installer"), [LIST]: page([harbour, ridge]) });
    renderAt("/clients");
    const table = await screen.findByRole("table", { name: "Clients" });
    expect(within(table).getAllByRole("columnheader").map((th) => th.textContent)).toEqual(["Name", "E-mail", "Phone", "Jobs", "Added"]);
    expect(screen.queryByRole("button", { name: "New client" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Edit" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Delete" })).toBeNull();
  });
});
