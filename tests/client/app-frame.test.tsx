import { cleanup, render, screen } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router-dom";
import { afterEach, describe, expect, it, vi } from "vitest";
import { AppProvider } from "../../src/app/provider";
import { routes } from "../../src/app/routes";

// Only the one endpoint the frame calls is stubbed: GET /api/health.
function stubHealth(status: number, body: unknown) {
  const fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    expect(String(input)).toBe("/api/health");
    return new Response(JSON.stringify(body), { status, headers: { "Content-Type": "application/json" } });
  });
  vi.stubGlobal("fetch", fetchMock);
  return fetchMock;
}

function renderAt(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  return render(
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>,
  );
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe("the app frame", () => {
  it("shows the database up when the health check says so", async () => {
    stubHealth(200, { status: "ok", db: "up", version: "0.1.0" });
    renderAt("/");
    expect(await screen.findByRole("status", { name: "Database up" })).toBeTruthy();
    expect(screen.getByText("v0.1.0")).toBeTruthy();
    expect(await screen.findByRole("heading", { name: "Dashboard" })).toBeTruthy();
  });

  it("shows the database down on a 503 health answer, in words and not colour alone", async () => {
    stubHealth(503, { status: "degraded", db: "down", version: "0.1.0" });
    renderAt("/jobs");
    const status = await screen.findByRole("status", { name: "Database down" });
    expect(status.textContent).toContain("Database");
    expect(status.textContent).toContain("down");
    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
  });

  it("says the server is unreachable when the request fails", async () => {
    vi.stubGlobal("fetch", vi.fn(async () => Promise.reject(new TypeError("Failed to fetch"))));
    renderAt("/clients");
    expect(await screen.findByRole("status", { name: "Server unreachable" })).toBeTruthy();
  });

  it("shows the 404 screen for an unknown address", async () => {
    stubHealth(200, { status: "ok", db: "up", version: "0.1.0" });
    renderAt("/quotes/nowhere");
    expect(await screen.findByRole("heading", { name: "Page not found" })).toBeTruthy();
    expect(screen.getByText("/quotes/nowhere")).toBeTruthy();
  });
});
