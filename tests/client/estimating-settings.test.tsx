import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, COMPANY, healthUp, sessionAs, stubApi, type Reply } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });
// The first test of the file also waits for the screen's code; under a busy machine that alone can pass vitest's 5 s.
vi.setConfig({ testTimeout: 15_000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const company = {
  id: COMPANY.id,
  name: COMPANY.name,
  licenceNumber: null,
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

const estimating = {
  wastePercent: 10,
  labourMinutesPerRun: 15,
  labourMinutesPerMetre: 0.5,
  labourMinutesPerTermination: 3,
  quoteValidDays: 30,
  quoteTerms: "Deposit due on acceptance. Balance on completion.",
  hasLogo: false,
};

const GET = "GET /api/company/estimating";
const PATCH = "PATCH /api/company/estimating";
const LOGO = "/api/company/logo";

function open(routes: Record<string, Reply>, role: "owner" | "estimator" | "installer" = "owner") {
  const api = stubApi({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp, "GET /api/company": { body: company }, ...routes });
  renderAt("/settings");
  return api;
}

const section = async () => {
  const heading = await screen.findByRole("heading", { level: 2, name: "Estimating and quotes" });
  return heading.closest("section") as HTMLElement;
};
const input = (scope: HTMLElement, label: string) => within(scope).getByLabelText(label) as HTMLInputElement;
const type = (scope: HTMLElement, label: string, value: string) => fireEvent.change(input(scope, label), { target: { value } });
const errorOf = (el: HTMLElement) => document.getElementById(el.getAttribute("aria-describedby")?.split(" ")[0] ?? "")?.textContent ?? "";
const png = (bytes = 68) => new File([new Uint8Array(bytes)], "logo.png", { type: "image/png" });

describe("Settings › Estimating and quotes", () => {
  it("shows the Owner the settings and saves the changed figures as numbers", async () => {
    const api = open({ [GET]: { body: estimating }, [PATCH]: (call) => ({ body: { ...estimating, ...(call.body as object) } }) });
    const s = await section();
    await waitFor(() => expect(input(s, "Waste (%)").value).toBe("10"));
    expect(input(s, "Minutes per run").value).toBe("15");
    expect(input(s, "Minutes per metre of run").value).toBe("0.5");
    expect(input(s, "Minutes per termination").value).toBe("3");
    expect(input(s, "Quote validity (days)").value).toBe("30");
    expect((within(s).getByLabelText("Default terms") as HTMLTextAreaElement).value).toBe(estimating.quoteTerms);

    type(s, "Waste (%)", " 12.5 ");
    type(s, "Minutes per run", "20");
    type(s, "Minutes per metre of run", "0.75");
    type(s, "Quote validity (days)", "45");
    fireEvent.change(within(s).getByLabelText("Default terms"), { target: { value: "  50 % deposit on acceptance.\nBalance within 14 days.  " } });
    fireEvent.click(within(s).getByRole("button", { name: "Save estimating settings" }));
    expect(await within(s).findByRole("status", { name: "Estimating settings saved" })).toBeTruthy();
    expect(api.callsTo(PATCH).map((c) => c.body)).toEqual([
      {
        wastePercent: 12.5,
        labourMinutesPerRun: 20,
        labourMinutesPerMetre: 0.75,
        labourMinutesPerTermination: 3,
        quoteValidDays: 45,
        quoteTerms: "50 % deposit on acceptance.\nBalance within 14 days.",
      },
    ]);
    expect(input(s, "Quote validity (days)").value).toBe("45");
    expect(api.unexpected).toEqual([]);
  });

  it("refuses figures the settings cannot take, beside their fields, without saving", async () => {
    const api = open({ [GET]: { body: estimating }, [PATCH]: { body: estimating } });
    const s = await section();
    await waitFor(() => expect(input(s, "Waste (%)").value).toBe("10"));
    type(s, "Waste (%)", "ten");
    type(s, "Quote validity (days)", "30.5");
    type(s, "Minutes per termination", "-1");
    fireEvent.click(within(s).getByRole("button", { name: "Save estimating settings" }));
    await waitFor(() => expect(input(s, "Waste (%)").getAttribute("aria-invalid")).toBe("true"));
    expect(errorOf(input(s, "Waste (%)"))).toContain("waste must be a number");
    expect(errorOf(input(s, "Quote validity (days)"))).toContain("validity must be whole days");
    expect(errorOf(input(s, "Minutes per termination"))).toContain("minutes per termination cannot be negative");
    expect(api.callsTo(PATCH)).toHaveLength(0);
  });

  it("puts the server's field error beside its field", async () => {
    const api = open({
      [GET]: { body: estimating },
      [PATCH]: apiError(400, "invalid_input", "terms may not contain control characters", { fields: { quoteTerms: "terms may not contain control characters" } }),
    });
    const s = await section();
    await waitFor(() => expect(input(s, "Waste (%)").value).toBe("10"));
    fireEvent.click(within(s).getByRole("button", { name: "Save estimating settings" }));
    const terms = within(s).getByLabelText("Default terms");
    await waitFor(() => expect(terms.getAttribute("aria-invalid")).toBe("true"));
    expect(errorOf(terms)).toContain("terms may not contain control characters");
    expect(within(s).queryByRole("status", { name: "Estimating settings saved" })).toBeNull();
    expect(api.callsTo(PATCH)).toHaveLength(1);
  });

  it("shows the settings and the logo read-only to anyone but the Owner", async () => {
    const api = open({ [GET]: { body: { ...estimating, hasLogo: true } } }, "estimator");
    const s = await section();
    await waitFor(() => expect(input(s, "Waste (%)").value).toBe("10"));
    for (const label of ["Waste (%)", "Minutes per run", "Minutes per metre of run", "Minutes per termination", "Quote validity (days)", "Default terms"]) {
      expect(input(s, label).disabled, label).toBe(true);
    }
    expect(within(s).getByText(/Only the company's Owner can change these/)).toBeTruthy();
    expect(within(s).queryByRole("button", { name: "Save estimating settings" })).toBeNull();
    expect(within(s).getByRole("img", { name: "Company logo" }).getAttribute("src")).toMatch(/^\/api\/company\/logo\?v=/);
    expect(within(s).queryByRole("button", { name: /logo/ })).toBeNull();
    expect(within(s).queryByLabelText("Logo file")).toBeNull();
    expect(api.unexpected).toEqual([]);
  });

  it("says when the settings could not be loaded and tries again", async () => {
    let attempts = 0;
    open({ [GET]: () => (++attempts === 1 ? apiError(503, "service_unavailable", "The database is not answering.") : { body: estimating }) });
    const s = await section();
    expect(await within(s).findByText(/The estimating settings could not be loaded. The database is not answering./)).toBeTruthy();
    fireEvent.click(within(s).getByRole("button", { name: "Try again" }));
    await waitFor(() => expect(input(s, "Waste (%)").value).toBe("10"));
  });

  it("uploads a logo as multipart and shows it from an address that changes with each upload", async () => {
    const api = open({ [GET]: { body: estimating }, [`POST ${LOGO}`]: { body: { ...estimating, hasLogo: true } } });
    const s = await section();
    expect(await within(s).findByText(/No logo/)).toBeTruthy();
    expect(within(s).queryByRole("img", { name: "Company logo" })).toBeNull();

    fireEvent.change(within(s).getByLabelText("Logo file"), { target: { files: [png()] } });
    const img = await within(s).findByRole("img", { name: "Company logo" });
    const first = img.getAttribute("src");
    expect(first).toMatch(/^\/api\/company\/logo\?v=.+/);
    expect(within(s).getByRole("status", { name: "Logo saved" })).toBeTruthy();
    const [upload] = api.callsTo(`POST ${LOGO}`);
    expect(upload.headers.get("X-Runwright-Request")).toBe("1");
    const init = vi.mocked(fetch).mock.calls.find(([url, i]) => String(url) === LOGO && i?.method === "POST")![1]!;
    expect(((init.body as FormData).get("file") as File).name).toBe("logo.png");

    fireEvent.change(within(s).getByLabelText("Logo file"), { target: { files: [png(80)] } });
    await waitFor(() => expect(api.callsTo(`POST ${LOGO}`)).toHaveLength(2));
    await waitFor(() => expect(within(s).getByRole("img", { name: "Company logo" }).getAttribute("src")).not.toBe(first));
  });

  it("refuses a logo over 512 KB or of another type before sending it", async () => {
    const api = open({ [GET]: { body: estimating }, [`POST ${LOGO}`]: { body: { ...estimating, hasLogo: true } } });
    const s = await section();
    await within(s).findByText(/No logo/);
    fireEvent.change(within(s).getByLabelText("Logo file"), { target: { files: [png(512 * 1024 + 1)] } });
    expect((await within(s).findByRole("alert")).textContent).toContain("larger than 512 KB");
    fireEvent.change(within(s).getByLabelText("Logo file"), { target: { files: [new File(["<svg/>"], "logo.svg", { type: "image/svg+xml" })] } });
    await waitFor(() => expect(within(s).getByRole("alert").textContent).toContain("A logo must be a PNG or JPEG image."));
    expect(api.callsTo(`POST ${LOGO}`)).toHaveLength(0);
  });

  it("removes the logo after asking", async () => {
    const api = open({ [GET]: { body: { ...estimating, hasLogo: true } }, [`DELETE ${LOGO}`]: { status: 204 } });
    const s = await section();
    await within(s).findByRole("img", { name: "Company logo" });
    fireEvent.click(within(s).getByRole("button", { name: "Remove logo" }));
    const dialog = screen.getByRole("dialog", { name: "Remove the logo?" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Remove logo" }));
    await waitFor(() => expect(within(s).queryByRole("img", { name: "Company logo" })).toBeNull());
    expect(within(s).getByText(/No logo/)).toBeTruthy();
    expect(within(s).getByRole("status", { name: "Logo removed" })).toBeTruthy();
    expect(api.callsTo(`DELETE ${LOGO}`)).toHaveLength(1);
  });
});
