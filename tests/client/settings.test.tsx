import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { COMPANY, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const settings = {
  id: COMPANY.id,
  name: COMPANY.name,
  licenceNumber: "EC-20417",
  contactEmail: "office@kestrel.example",
  phone: null,
  address: null,
  currency: "USD",
  taxRatePercent: 8.25,
  defaultMarkupPercent: 30,
  labourRateMinor: 8500,
  depositPercent: 25,
  updatedAt: "2026-11-30T08:00:00.000Z",
};

const input = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
const type = (label: string, value: string) => fireEvent.change(input(label), { target: { value } });

// The Settings page also shows the estimating section (its own tests: estimating-settings.test.tsx).
const estimating = { wastePercent: 10, labourMinutesPerRun: 15, labourMinutesPerMetre: 0.5, labourMinutesPerTermination: 3, quoteValidDays: 30, quoteTerms: "", hasLogo: false };

describe("the Settings page", () => {
  it("shows the Owner the company's settings, the labour rate in dollars", async () => {
    stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": healthUp, "GET /api/company": { body: settings }, "GET /api/company/estimating": { body: estimating } });
    renderAt("/settings");
    expect(await screen.findByRole("heading", { level: 1, name: "Settings" })).toBeTruthy();
    expect(await screen.findByRole("heading", { level: 2, name: "Company" })).toBeTruthy();
    expect(input("Company name").value).toBe(COMPANY.name);
    expect(input("Licence number").value).toBe("EC-20417");
    expect(input("Phone").value).toBe("");
    expect(input("Currency").value).toBe("USD");
    expect(input("Tax rate (%)").value).toBe("8.25");
    expect(input("Labour rate per hour").value).toBe("85.00");
    expect(input("Labour rate per hour").disabled).toBe(false);
    expect(screen.getByRole("button", { name: "Save settings" })).toBeTruthy();
  });

  it("refuses a figure that is not a number, beside its field, without saving", async () => {
    const api = stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": healthUp, "GET /api/company": { body: settings }, "GET /api/company/estimating": { body: estimating } });
    renderAt("/settings");
    await screen.findByDisplayValue("85.00");
    type("Tax rate (%)", "eight");
    type("Labour rate per hour", "85.005");
    fireEvent.click(screen.getByRole("button", { name: "Save settings" }));
    await waitFor(() => expect(input("Tax rate (%)").getAttribute("aria-invalid")).toBe("true"));
    const errorId = input("Tax rate (%)").getAttribute("aria-describedby")?.split(" ")[0] ?? "";
    expect(document.getElementById(errorId)?.textContent).toContain("tax rate must be a number");
    expect(api.callsTo("PATCH /api/company")).toHaveLength(0);
  });

  it("saves: figures become numbers, the labour rate goes in cents, blanks become null", async () => {
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/company": { body: settings },
      "GET /api/company/estimating": { body: estimating },
      "PATCH /api/company": (call) => ({ body: { ...settings, ...(call.body as object), updatedAt: "2026-12-02T08:00:00.000Z" } }),
    });
    renderAt("/settings");
    await screen.findByDisplayValue("85.00");
    type("Labour rate per hour", "90.5");
    type("Tax rate (%)", " 7.5 ");
    type("Licence number", "  ");
    type("Currency", "usd");
    fireEvent.click(screen.getByRole("button", { name: "Save settings" }));
    expect(await screen.findByRole("status", { name: "Settings saved" })).toBeTruthy();
    expect(api.callsTo("PATCH /api/company").map((c) => c.body)).toEqual([
      {
        name: COMPANY.name,
        licenceNumber: null,
        contactEmail: "office@kestrel.example",
        phone: null,
        address: null,
        currency: "USD",
        taxRatePercent: 7.5,
        defaultMarkupPercent: 30,
        labourRateMinor: 9050,
        depositPercent: 25,
      },
    ]);
    expect(input("Labour rate per hour").value).toBe("90.50");
  });

  it("shows the settings read-only to anyone but the Owner", async () => {
    const api = stubApi({ "GET /api/auth/session": sessionAs("installer"), "GET /api/health": healthUp, "GET /api/company": { body: settings }, "GET /api/company/estimating": { body: estimating } });
    renderAt("/settings");
    expect(await screen.findByDisplayValue("85.00")).toBeTruthy();
    for (const label of ["Company name", "Licence number", "Contact e-mail", "Phone", "Address", "Currency", "Tax rate (%)", "Default markup (%)", "Labour rate per hour", "Deposit (%)"]) {
      expect(input(label).disabled, label).toBe(true);
    }
    expect(screen.getByText(/Only the company's Owner can change these settings/)).toBeTruthy();
    expect(screen.queryByRole("button", { name: "Save settings" })).toBeNull();
    expect(api.unexpected).toEqual([]);
  });
});
