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

const profile = (id: string, name: string, extra: Record<string, unknown> = {}) => ({
  id,
  name,
  branchPercent: 3,
  totalPercent: 5,
  criticalPercent: 3,
  nearFraction: 0.8,
  notes: null,
  builtIn: false,
  systemCount: 0,
  updatedAt: "2026-11-01T09:00:00.000Z",
  ...extra,
});
const general = profile("1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d", "General 3 % / 5 %", {
  builtIn: true,
  notes: "NFPA 70 210.19(A) and 215.2 informational notes",
  systemCount: 4,
});
const marine = profile("2b3c4d5e-6f7a-4b8c-9d0e-1f2a3b4c5d6e", "Marine 10 % non-critical", {
  branchPercent: 10,
  totalPercent: 10,
  nearFraction: 0.75,
  systemCount: 2,
});
const LIST = "GET /api/limit-profiles?page=1&pageSize=100&sort=name";
const page = (items: unknown[]) => ({ body: { items, total: items.length, page: 1, pageSize: 100 } });
const base = (role: "owner" | "estimator" | "installer") => ({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp });

const rowOf = async (name: RegExp) => within(await screen.findByRole("table", { name: "Limit profiles" })).getByRole("row", { name });

describe("the Limit profiles page", () => {
  it("lists the profiles; the Owner may duplicate a built-in one but not edit or delete it", async () => {
    const api = stubApi({ ...base("owner"), [LIST]: page([general, marine]) });
    renderAt("/settings/limit-profiles");
    expect(await screen.findByRole("heading", { level: 1, name: "Limit profiles" })).toBeTruthy();
    const table = await screen.findByRole("table", { name: "Limit profiles" });
    expect(within(table).getAllByRole("columnheader").map((th) => th.textContent)).toEqual([
      "Name",
      "Branch",
      "Total",
      "Critical",
      "Near limit from",
      "Notes or source",
      "Systems",
      "Actions",
    ]);
    const builtIn = within(table).getByRole("row", { name: /General/ });
    expect(builtIn.textContent).toContain("Built-in");
    expect(builtIn.textContent).toContain("NFPA 70 210.19(A)");
    expect(within(builtIn).getAllByRole("cell").map((td) => td.textContent).slice(0, 6)).toEqual(["3 %", "5 %", "3 %", "80 % of the limit", "NFPA 70 210.19(A) and 215.2 informational notes", "4"]);
    expect(within(builtIn).getByRole("button", { name: "Duplicate" })).toBeTruthy();
    expect(within(builtIn).queryByRole("button", { name: "Edit" })).toBeNull();
    expect(within(builtIn).queryByRole("button", { name: "Delete" })).toBeNull();

    const own = within(table).getByRole("row", { name: /Marine/ });
    expect(own.textContent).not.toContain("Built-in");
    expect(own.textContent).toContain("75 % of the limit");
    expect(within(own).getByRole("button", { name: "Edit" })).toBeTruthy();
    expect(within(own).getByRole("button", { name: "Delete" })).toBeTruthy();
    expect(api.unexpected).toEqual([]);
  });

  it("duplicates a profile into a prefilled form, sending the near-limit threshold as a fraction", async () => {
    let created = false;
    const copy = profile("3c4d5e6f-7a8b-4c9d-8e0f-2a3b4c5d6e7f", "General 3 % / 5 % (copy)", { nearFraction: 0.85 });
    const api = stubApi({
      ...base("owner"),
      [LIST]: () => page(created ? [general, copy, marine] : [general, marine]),
      "POST /api/limit-profiles": () => {
        created = true;
        return { status: 201, body: copy };
      },
    });
    renderAt("/settings/limit-profiles");
    fireEvent.click(within(await rowOf(/General/)).getByRole("button", { name: "Duplicate" }));
    const dialog = screen.getByRole("dialog", { name: "Duplicate General 3 % / 5 %" });
    const value = (label: string) => (within(dialog).getByLabelText(label) as HTMLInputElement).value;
    expect(value("Name")).toBe("General 3 % / 5 % (copy)");
    expect(value("Branch limit (%)")).toBe("3");
    expect(value("Total limit (%)")).toBe("5");
    expect(value("Critical limit (%)")).toBe("3");
    expect(value("Near limit from (% of the limit)")).toBe("80");
    expect(value("Notes or source")).toBe("NFPA 70 210.19(A) and 215.2 informational notes");

    fireEvent.change(within(dialog).getByLabelText("Near limit from (% of the limit)"), { target: { value: "85" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create limit profile" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(await rowOf(/\(copy\)/)).toBeTruthy();
    expect(api.callsTo("POST /api/limit-profiles").map((c) => c.body)).toEqual([
      { name: "General 3 % / 5 % (copy)", branchPercent: 3, totalPercent: 5, criticalPercent: 3, nearFraction: 0.85, notes: "NFPA 70 210.19(A) and 215.2 informational notes" },
    ]);
  });

  it("checks the figures before sending a new profile", async () => {
    const api = stubApi({ ...base("owner"), [LIST]: page([general]) });
    renderAt("/settings/limit-profiles");
    fireEvent.click(await screen.findByRole("button", { name: "New limit profile" }));
    const dialog = screen.getByRole("dialog", { name: "New limit profile" });
    fireEvent.change(within(dialog).getByLabelText("Name"), { target: { value: "Tight" } });
    fireEvent.change(within(dialog).getByLabelText("Branch limit (%)"), { target: { value: "two" } });
    fireEvent.change(within(dialog).getByLabelText("Total limit (%)"), { target: { value: "140" } });
    fireEvent.change(within(dialog).getByLabelText("Near limit from (% of the limit)"), { target: { value: "100" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Create limit profile" }));
    await waitFor(() => expect(within(dialog).getByLabelText("Branch limit (%)").getAttribute("aria-invalid")).toBe("true"));
    expect(dialog.textContent).toContain("branch limit must be a number");
    expect(dialog.textContent).toContain("total limit must be at most 100 %");
    expect(dialog.textContent).toContain("near-limit threshold must be less than 100 %");
    expect(within(dialog).getByLabelText("Critical limit (%)").getAttribute("aria-invalid")).toBe("false");
    expect(api.callsTo("POST /api/limit-profiles")).toHaveLength(0);
  });

  it("edits the company's own profile and shows why one in use cannot be deleted", async () => {
    const api = stubApi({
      ...base("owner"),
      [LIST]: page([general, marine]),
      [`PATCH /api/limit-profiles/${marine.id}`]: (call) => ({ body: { ...marine, ...(call.body as object) } }),
      [`DELETE /api/limit-profiles/${marine.id}`]: apiError(409, "conflict", "2 systems use this limit profile; choose another profile for them first"),
    });
    renderAt("/settings/limit-profiles");
    fireEvent.click(within(await rowOf(/Marine/)).getByRole("button", { name: "Edit" }));
    const dialog = screen.getByRole("dialog", { name: "Edit Marine 10 % non-critical" });
    expect((within(dialog).getByLabelText("Near limit from (% of the limit)") as HTMLInputElement).value).toBe("75");
    fireEvent.change(within(dialog).getByLabelText("Critical limit (%)"), { target: { value: "2.5" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Save limit profile" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(`PATCH /api/limit-profiles/${marine.id}`).map((c) => c.body)).toEqual([
      { name: "Marine 10 % non-critical", branchPercent: 10, totalPercent: 10, criticalPercent: 2.5, nearFraction: 0.75, notes: null },
    ]);

    fireEvent.click(within(await rowOf(/Marine/)).getByRole("button", { name: "Delete" }));
    const confirm = screen.getByRole("dialog", { name: "Delete Marine 10 % non-critical?" });
    expect(confirm.textContent).toContain("2 systems use this profile");
    fireEvent.click(within(confirm).getByRole("button", { name: "Delete profile" }));
    expect((await screen.findByRole("alert")).textContent).toContain("Marine 10 % non-critical was not deleted: 2 systems use this limit profile");
    expect(api.callsTo(`DELETE /api/limit-profiles/${marine.id}`)).toHaveLength(1);
  });

  it("shows everyone but the Owner the profiles read-only", async () => {
    stubApi({ ...base("estimator"), [LIST]: page([general, marine]) });
    renderAt("/settings/limit-profiles");
    const table = await screen.findByRole("table", { name: "Limit profiles" });
    expect(within(table).getAllByRole("columnheader")).toHaveLength(7);
    expect(screen.getByText(/Only the company's Owner can add or change limit profiles/)).toBeTruthy();
    for (const name of ["New limit profile", "Duplicate", "Edit", "Delete"]) expect(screen.queryByRole("button", { name })).toBeNull();
  });

  it("is linked from Settings for every role", async () => {
    stubApi({
      ...base("installer"),
      "GET /api/company": {
        body: {
          id: "5f0c7a52-1c3e-4d8b-9a61-2b7e4c9d0a11",
          name: "Kestrel Bay DC Works",
          licenceNumber: null,
          contactEmail: null,
          phone: null,
          address: null,
          currency: "USD",
          taxRatePercent: 0,
          defaultMarkupPercent: 30,
          labourRateMinor: 8500,
          depositPercent: 25,
          updatedAt: "2026-11-30T08:00:00.000Z",
        },
      },
    });
    renderAt("/settings");
    const link = await screen.findByRole("link", { name: "Limit profiles" });
    expect(link.getAttribute("href")).toBe("/settings/limit-profiles");
  });
});
