import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { COMPANY, OTHER_COMPANY, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

// The frame calls two endpoints: GET /api/auth/session (it needs a signed-in user) and GET /api/health.
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe("the app frame", () => {
  it("shows the database up when the health check says so", async () => {
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/dashboard": {
        body: {
          currency: "USD",
          month: "2026-12",
          byStatus: [],
          awaiting: [],
          activity: [],
          overLimitSystems: [],
          deposits: { receivedThisMonth: { count: 0, amountMinor: 0, refundedMinor: 0 }, outstanding: { count: 0, amountMinor: 0 }, flagged: [] },
        },
      },
    });
    renderAt("/");
    expect(await screen.findByRole("status", { name: "Database up" })).toBeTruthy();
    expect(screen.getByText("v0.1.0")).toBeTruthy();
    expect(await screen.findByRole("heading", { name: "Dashboard" })).toBeTruthy();
    expect(api.unexpected).toEqual([]);
  });

  it("shows the database down on a 503 health answer, in words and not colour alone", async () => {
    stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": { status: 503, body: { status: "degraded", db: "down", version: "0.1.0" } },
      "GET /api/jobs?page=1&pageSize=25&sort=-updatedAt": { body: { items: [], total: 0, page: 1, pageSize: 25 } },
    });
    renderAt("/jobs");
    const status = await screen.findByRole("status", { name: "Database down" });
    expect(status.textContent).toContain("Database");
    expect(status.textContent).toContain("down");
    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
  });

  it("says the server is unreachable when the health request fails", async () => {
    stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": "network-error" });
    renderAt("/clients");
    expect(await screen.findByRole("status", { name: "Server unreachable" })).toBeTruthy();
  });

  it("shows the 404 screen for an unknown address", async () => {
    stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": healthUp });
    renderAt("/quotes/nowhere");
    expect(await screen.findByRole("heading", { name: "Page not found" })).toBeTruthy();
    expect(screen.getByText("/quotes/nowhere")).toBeTruthy();
  });

  it("lists Team between Price list and Settings, and shows who is signed in, where and as what", async () => {
    stubApi({ "GET /api/auth/session": sessionAs("estimator"), "GET /api/health": healthUp });
    renderAt("/");
    await screen.findByRole("heading", { name: "Dashboard" });
    const nav = screen.getByRole("navigation", { name: "Main" });
    expect(within(nav).getAllByRole("link").map((a) => a.textContent)).toEqual(["Dashboard", "Jobs", "Clients", "Price list", "Team", "Settings"]);
    const account = screen.getByRole("region", { name: "Account" });
    expect(account.textContent).toContain("Ada Quill");
    expect(account.textContent).toContain(COMPANY.name);
    expect(account.textContent).toContain("Estimator");
    // One company: no switcher.
    expect(within(account).queryByLabelText("Company")).toBeNull();
  });

  it("signs out: calls the API, forgets the session and shows the sign-in page", async () => {
    const api = stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": healthUp, "POST /api/auth/sign-out": { status: 204 } });
    const router = renderAt("/jobs");
    fireEvent.click(await screen.findByRole("button", { name: "Sign out" }));
    expect(await screen.findByRole("heading", { level: 1, name: "Sign in" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/sign-in");
    expect(api.callsTo("POST /api/auth/sign-out")).toHaveLength(1);
    // The sign-in page does not ask again: the sign-out answer already said "signed out".
    expect(api.callsTo("GET /api/auth/session")).toHaveLength(1);
  });

  it("switches company from the side rail when the user belongs to several", async () => {
    const memberships = [
      { company: COMPANY, role: "owner" },
      { company: OTHER_COMPANY, role: "installer" },
    ];
    const switched = {
      status: 200,
      body: { ...sessionAs("installer").body, company: OTHER_COMPANY, role: "installer", memberships },
    };
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner", { memberships }),
      "GET /api/health": healthUp,
      "POST /api/auth/switch-company": switched,
    });
    renderAt("/");
    const select = (await screen.findByLabelText("Company")) as HTMLSelectElement;
    expect(select.value).toBe(COMPANY.id);
    fireEvent.change(select, { target: { value: OTHER_COMPANY.id } });
    await waitFor(() => expect(screen.getByRole("region", { name: "Account" }).textContent).toContain("Installer"));
    expect((screen.getByLabelText("Company") as HTMLSelectElement).value).toBe(OTHER_COMPANY.id);
    expect(api.callsTo("POST /api/auth/switch-company").map((c) => c.body)).toEqual([{ companyId: OTHER_COMPANY.id }]);
  });

  it("says so, with a way to try again, when the session cannot be checked", async () => {
    stubApi({ "GET /api/auth/session": "network-error" });
    renderAt("/");
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("The server could not be reached");
    expect(screen.getByRole("button", { name: "Try again" })).toBeTruthy();
    expect(screen.queryByRole("navigation", { name: "Main" })).toBeNull();
  });
});
