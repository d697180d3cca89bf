import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, COMPANY, healthUp, sessionAs, signedOut, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const type = (label: string, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });

/** The text of everything an input's aria-describedby points at (its error and hint). */
function descriptionOf(input: HTMLElement): string {
  const ids = input.getAttribute("aria-describedby")?.split(" ") ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent ?? "").join(" ");
}

// A link token of the shape the server issues: `<uuid>.<43 base64url characters>`.
const TOKEN = `1a2b3c4d-5e6f-4a1b-8c2d-3e4f5a6b7c8d.${"Qx7_-".repeat(8)}Qx7`;

describe("signing in", () => {
  it("sends a signed-out visit to /jobs to the sign-in page, and back to /jobs after signing in", async () => {
    const api = stubApi({
      "GET /api/auth/session": signedOut,
      "POST /api/auth/sign-in": sessionAs("estimator"),
      "GET /api/health": healthUp,
      "GET /api/jobs?page=1&pageSize=25&sort=-updatedAt": { body: { items: [], total: 0, page: 1, pageSize: 25 } },
    });
    const router = renderAt("/jobs");
    expect(await screen.findByRole("heading", { level: 1, name: "Sign in" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/sign-in");
    expect(router.state.location.search).toBe("?next=%2Fjobs");

    type("E-mail", "  Ada@Kestrel.Example ");
    type("Password", "copper-lugs-24v");
    fireEvent.click(screen.getByRole("button", { name: "Sign in" }));

    expect(await screen.findByRole("heading", { name: "No jobs yet" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/jobs");
    // The form sends what the shared schema makes of the input: the e-mail trimmed and lower-cased.
    expect(api.callsTo("POST /api/auth/sign-in").map((c) => c.body)).toEqual([{ email: "ada@kestrel.example", password: "copper-lugs-24v" }]);
    expect(api.unexpected).toEqual([]);
  });

  it("shows the server's 401 message in the form and stays on the page", async () => {
    stubApi({
      "GET /api/auth/session": signedOut,
      "POST /api/auth/sign-in": apiError(401, "unauthenticated", "E-mail or password is wrong"),
    });
    const router = renderAt("/sign-in");
    await screen.findByRole("heading", { level: 1, name: "Sign in" });
    type("E-mail", "ada@kestrel.example");
    type("Password", "not-the-password");
    fireEvent.click(screen.getByRole("button", { name: "Sign in" }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("E-mail or password is wrong");
    expect(router.state.location.pathname).toBe("/sign-in");
    expect((screen.getByRole("button", { name: "Sign in" }) as HTMLButtonElement).disabled).toBe(false);
  });

  it("shows a 429 rate limit's message too", async () => {
    stubApi({
      "GET /api/auth/session": signedOut,
      "POST /api/auth/sign-in": apiError(429, "rate_limited", "Too many sign-in attempts; wait 15 minutes and try again"),
    });
    renderAt("/sign-in");
    await screen.findByRole("heading", { level: 1, name: "Sign in" });
    type("E-mail", "ada@kestrel.example");
    type("Password", "whatever-it-is");
    fireEvent.click(screen.getByRole("button", { name: "Sign in" }));
    expect((await screen.findByRole("alert")).textContent).toContain("Too many sign-in attempts");
  });

  it("ignores a `next` that would leave the site", async () => {
    stubApi({ "GET /api/auth/session": signedOut, "POST /api/auth/sign-in": sessionAs("owner"), "GET /api/health": healthUp });
    const router = renderAt("/sign-in?next=%2F%2Fevil.example%2Fx");
    await screen.findByRole("heading", { level: 1, name: "Sign in" });
    type("E-mail", "ada@kestrel.example");
    type("Password", "copper-lugs-24v");
    fireEvent.click(screen.getByRole("button", { name: "Sign in" }));
    expect(await screen.findByRole("heading", { level: 1, name: "Dashboard" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/");
  });

  it("sends someone already signed in from /sign-in to the dashboard", async () => {
    stubApi({ "GET /api/auth/session": sessionAs("owner"), "GET /api/health": healthUp });
    const router = renderAt("/sign-in");
    expect(await screen.findByRole("heading", { level: 1, name: "Dashboard" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/");
  });

  it("links to the password reset and sign-up pages", async () => {
    stubApi({ "GET /api/auth/session": signedOut });
    renderAt("/sign-in");
    expect((await screen.findByRole("link", { name: "Forgot your password?" })).getAttribute("href")).toBe("/forgot-password");
    expect(screen.getByRole("link", { name: "Create a company account" }).getAttribute("href")).toBe("/sign-up");
    const email = screen.getByLabelText("E-mail");
    expect(email.getAttribute("autocomplete")).toBe("email");
    expect(screen.getByLabelText("Password").getAttribute("autocomplete")).toBe("current-password");
  });
});

describe("signing up", () => {
  async function fillSignUp(email: string, password: string) {
    await screen.findByRole("heading", { level: 1, name: "Create your company account" });
    type("Company name", "Kestrel Bay DC Works");
    type("Your name", "Ada Quill");
    type("E-mail", email);
    type("Password", password);
    fireEvent.click(screen.getByRole("button", { name: "Create account" }));
  }

  it("shows the shared schema's errors beside the Password field without calling the API", async () => {
    const api = stubApi({ "GET /api/auth/session": signedOut });
    renderAt("/sign-up");

    await fillSignUp("ada@kestrel.example", "short");
    const password = screen.getByLabelText("Password");
    await waitFor(() => expect(password.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(password)).toContain("password must be at least 10 characters");

    // Long enough, but the e-mail itself.
    type("Password", "Ada@Kestrel.Example");
    fireEvent.click(screen.getByRole("button", { name: "Create account" }));
    await waitFor(() => expect(descriptionOf(password)).toContain("password must not be your e-mail address"));
    expect(screen.getByLabelText("E-mail").getAttribute("aria-invalid")).toBe("false");

    expect(api.callsTo("POST /api/auth/sign-up")).toHaveLength(0);
    expect(api.calls.map((c) => `${c.method} ${c.url}`)).toEqual(["GET /api/auth/session"]);
  });

  it("puts a 409 with details.field \"email\" beside the E-mail field", async () => {
    const api = stubApi({
      "GET /api/auth/session": signedOut,
      "POST /api/auth/sign-up": apiError(409, "conflict", "An account with this e-mail already exists", { field: "email" }),
    });
    renderAt("/sign-up");
    await fillSignUp("ada@kestrel.example", "copper-lugs-24v");
    const email = screen.getByLabelText("E-mail");
    await waitFor(() => expect(email.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(email)).toContain("An account with this e-mail already exists");
    // Placed beside its field, so not repeated in the form's alert box.
    expect(screen.queryByRole("alert")).toBeNull();
    expect(api.callsTo("POST /api/auth/sign-up").map((c) => c.body)).toEqual([
      { companyName: "Kestrel Bay DC Works", name: "Ada Quill", email: "ada@kestrel.example", password: "copper-lugs-24v" },
    ]);
  });

  it("signs the new owner in and opens the dashboard", async () => {
    stubApi({ "GET /api/auth/session": signedOut, "POST /api/auth/sign-up": { status: 201, body: sessionAs("owner").body }, "GET /api/health": healthUp });
    const router = renderAt("/sign-up");
    await fillSignUp("ada@kestrel.example", "copper-lugs-24v");
    expect(await screen.findByRole("heading", { level: 1, name: "Dashboard" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/");
    expect(screen.getByRole("region", { name: "Account" }).textContent).toContain(COMPANY.name);
  });
});

describe("password reset", () => {
  it("shows the server's answer to a reset request in a status message", async () => {
    const message = "If an account uses that e-mail, we have sent it a link to set a new password. The link works for one hour.";
    const api = stubApi({ "POST /api/auth/forgot-password": { status: 202, body: { message } } });
    renderAt("/forgot-password");
    await screen.findByRole("heading", { level: 1, name: "Reset your password" });
    type("E-mail", "ada@kestrel.example");
    fireEvent.click(screen.getByRole("button", { name: "Send reset link" }));
    expect((await screen.findByRole("status", { name: message })).textContent).toContain(message);
    expect(api.callsTo("POST /api/auth/forgot-password").map((c) => c.body)).toEqual([{ email: "ada@kestrel.example" }]);
  });

  it("says the link is incomplete when /reset-password has no token, and offers a new one", async () => {
    const api = stubApi({});
    renderAt("/reset-password");
    await screen.findByRole("heading", { level: 1, name: "Set a new password" });
    expect(screen.getByRole("alert").textContent).toContain("no token");
    expect(screen.queryByLabelText("New password")).toBeNull();
    expect(screen.getByRole("link", { name: "Ask for a new reset link" }).getAttribute("href")).toBe("/forgot-password");
    expect(api.calls).toEqual([]);
  });

  it("sets the new password with the fragment's token and opens the dashboard", async () => {
    const api = stubApi({ "POST /api/auth/reset-password": sessionAs("owner"), "GET /api/health": healthUp });
    const router = renderAt(`/reset-password#token=${TOKEN}`);
    await screen.findByRole("heading", { level: 1, name: "Set a new password" });
    type("New password", "fresh-copper-48v");
    fireEvent.click(screen.getByRole("button", { name: "Set password" }));
    expect(await screen.findByRole("heading", { level: 1, name: "Dashboard" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/");
    expect(api.callsTo("POST /api/auth/reset-password").map((c) => c.body)).toEqual([{ token: TOKEN, password: "fresh-copper-48v" }]);
  });

  it("shows a used link's 410 message in the form", async () => {
    stubApi({ "POST /api/auth/reset-password": apiError(410, "gone", "This link has already been used; ask for a new one", { field: "token" }) });
    renderAt(`/reset-password#token=${TOKEN}`);
    await screen.findByRole("heading", { level: 1, name: "Set a new password" });
    type("New password", "fresh-copper-48v");
    fireEvent.click(screen.getByRole("button", { name: "Set password" }));
    expect((await screen.findByRole("alert")).textContent).toContain("This link has already been used");
  });
});

describe("joining from an invitation", () => {
  const preview = { companyName: COMPANY.name, email: "ravi@kestrel.example", role: "estimator", expiresAt: "2026-12-09T10:00:00.000Z", hasAccount: false };

  it("reads the token from the fragment, shows the invitation and accepts it with a name and a new password", async () => {
    const api = stubApi({
      "POST /api/invitations/lookup": { body: preview },
      "POST /api/invitations/accept": { status: 201, body: sessionAs("estimator").body },
      "GET /api/health": healthUp,
    });
    const router = renderAt(`/join#token=${TOKEN}`);
    expect(await screen.findByRole("heading", { level: 1, name: `Join ${COMPANY.name}` })).toBeTruthy();
    expect(api.callsTo("POST /api/invitations/lookup").map((c) => c.body)).toEqual([{ token: TOKEN }]);
    expect(screen.getByText("ravi@kestrel.example")).toBeTruthy();
    expect(screen.getByText("Estimator")).toBeTruthy();
    expect(screen.queryByLabelText("Your Runwright password")).toBeNull();

    type("Your name", "Ravi Patel");
    type("Choose a password", "ravi@kestrel.example");
    fireEvent.click(screen.getByRole("button", { name: "Accept invitation" }));
    await waitFor(() => expect(descriptionOf(screen.getByLabelText("Choose a password"))).toContain("must not be your e-mail"));
    expect(api.callsTo("POST /api/invitations/accept")).toHaveLength(0);

    type("Choose a password", "estimates-in-24v");
    fireEvent.click(screen.getByRole("button", { name: "Accept invitation" }));
    expect(await screen.findByRole("heading", { level: 1, name: "Dashboard" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/");
    expect(api.callsTo("POST /api/invitations/accept").map((c) => c.body)).toEqual([{ token: TOKEN, name: "Ravi Patel", password: "estimates-in-24v" }]);
  });

  it("asks an existing account only for its password", async () => {
    const api = stubApi({
      "POST /api/invitations/lookup": { body: { ...preview, hasAccount: true } },
      "POST /api/invitations/accept": apiError(401, "unauthenticated", "The password of your existing Runwright account is wrong", { field: "password" }),
    });
    renderAt(`/join#token=${TOKEN}`);
    await screen.findByRole("heading", { level: 1, name: `Join ${COMPANY.name}` });
    expect(screen.queryByLabelText("Your name")).toBeNull();
    expect(screen.getByText(/adds Kestrel Bay DC Works to that account/)).toBeTruthy();
    type("Your Runwright password", "old-password");
    fireEvent.click(screen.getByRole("button", { name: "Accept invitation" }));
    const password = screen.getByLabelText("Your Runwright password");
    await waitFor(() => expect(password.getAttribute("aria-invalid")).toBe("true"));
    expect(descriptionOf(password)).toContain("The password of your existing Runwright account is wrong");
    expect(api.callsTo("POST /api/invitations/accept").map((c) => c.body)).toEqual([{ token: TOKEN, password: "old-password" }]);
  });

  it("shows the server's message for an expired invitation", async () => {
    stubApi({ "POST /api/invitations/lookup": apiError(410, "gone", "This invitation has expired; ask for a new one", { field: "token" }) });
    renderAt(`/join#token=${TOKEN}`);
    expect((await screen.findByRole("alert")).textContent).toContain("This invitation has expired");
    expect(screen.queryByRole("button", { name: "Accept invitation" })).toBeNull();
  });

  it("says the link is incomplete when there is no token, without asking the server", async () => {
    const api = stubApi({});
    renderAt("/join");
    expect((await screen.findByRole("alert")).textContent).toContain("no token");
    expect(api.calls).toEqual([]);
  });
});
