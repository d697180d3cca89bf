import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, COMPANY, healthUp, sessionAs, stubApi } from "./api-stub";
import { renderAt } from "./render-app";

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const me = sessionAs("owner").body.user;
const members = [
  { userId: me.id, name: me.name, email: me.email, role: "owner", joinedAt: "2026-01-05T09:00:00.000Z", lastSignInAt: "2026-11-30T08:00:00.000Z" },
  { userId: "7c1d9e2f-3a4b-4c5d-8e6f-9a0b1c2d3e4f", name: "Bo Lindqvist", email: "bo@kestrel.example", role: "estimator", joinedAt: "2026-02-01T09:00:00.000Z", lastSignInAt: null },
];
const bo = members[1];
const pending = {
  id: "2e3f4a5b-6c7d-4e8f-9a0b-1c2d3e4f5a6b",
  email: "cleo@kestrel.example",
  role: "installer",
  expiresAt: "2026-12-09T10:00:00.000Z",
  invitedBy: me.name,
  createdAt: "2026-12-02T10:00:00.000Z",
};

describe("the Team page", () => {
  it("shows an Estimator the members read-only, with no invite form and no invitations asked for", async () => {
    const api = stubApi({ "GET /api/auth/session": sessionAs("estimator"), "GET /api/health": healthUp, "GET /api/members": { body: { members } } });
    renderAt("/team");
    expect(await screen.findByRole("heading", { level: 1, name: "Team" })).toBeTruthy();
    const table = await screen.findByRole("table", { name: "Members" });
    expect(within(table).getAllByRole("columnheader").map((th) => th.textContent)).toEqual(["Name", "E-mail", "Role", "Last signed in"]);
    const boRow = within(table).getByRole("row", { name: /Bo Lindqvist/ });
    expect(boRow.textContent).toContain("Estimator");
    expect(boRow.textContent).toContain("Never");
    expect(within(table).getByRole("rowheader", { name: `${me.name} (you)` })).toBeTruthy();

    expect(screen.queryByRole("heading", { name: "Invite someone" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Send invitation" })).toBeNull();
    expect(screen.queryByRole("heading", { name: "Pending invitations" })).toBeNull();
    expect(screen.queryByRole("combobox", { name: `Role for ${bo.name}` })).toBeNull();
    expect(screen.queryByRole("button", { name: "Remove" })).toBeNull();
    expect(api.callsTo("GET /api/invitations")).toHaveLength(0);
    expect(api.unexpected).toEqual([]);
  });

  it("lets the Owner change a role, and shows the server's refusal", async () => {
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/members": { body: { members } },
      "GET /api/invitations": { body: { invitations: [] } },
      [`PATCH /api/members/${bo.userId}`]: { body: { ...bo, role: "installer" } },
      [`PATCH /api/members/${me.id}`]: apiError(409, "conflict", "The company must keep at least one Owner"),
    });
    renderAt("/team");
    const boRole = (await screen.findByRole("combobox", { name: `Role for ${bo.name}` })) as HTMLSelectElement;
    expect(boRole.value).toBe("estimator");
    fireEvent.change(boRole, { target: { value: "installer" } });
    await waitFor(() => expect(api.callsTo(`PATCH /api/members/${bo.userId}`).map((c) => c.body)).toEqual([{ role: "installer" }]));
    await waitFor(() => expect((screen.getByRole("combobox", { name: `Role for ${bo.name}` }) as HTMLSelectElement).value).toBe("installer"));

    const myRole = screen.getByRole("combobox", { name: `Role for ${me.name}` }) as HTMLSelectElement;
    fireEvent.change(myRole, { target: { value: "estimator" } });
    expect((await screen.findByRole("alert")).textContent).toContain("The company must keep at least one Owner");
    await waitFor(() => expect((screen.getByRole("combobox", { name: `Role for ${me.name}` }) as HTMLSelectElement).value).toBe("owner"));
  });

  it("asks before removing a member, in a dialog; Cancel keeps them, Remove removes them", async () => {
    let removed = false;
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/members": () => ({ body: { members: removed ? [members[0]] : members } }),
      "GET /api/invitations": { body: { invitations: [] } },
      [`DELETE /api/members/${bo.userId}`]: () => {
        removed = true;
        return { status: 204 };
      },
    });
    renderAt("/team");
    const table = await screen.findByRole("table", { name: "Members" });
    const boRow = within(table).getByRole("row", { name: /Bo Lindqvist/ });

    fireEvent.click(within(boRow).getByRole("button", { name: "Remove" }));
    let dialog = screen.getByRole("dialog", { name: `Remove ${bo.name} from ${COMPANY.name}?` });
    expect(document.activeElement).toBe(within(dialog).getByRole("button", { name: "Cancel" }));
    fireEvent.click(within(dialog).getByRole("button", { name: "Cancel" }));
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(api.callsTo(`DELETE /api/members/${bo.userId}`)).toHaveLength(0);

    fireEvent.click(within(boRow).getByRole("button", { name: "Remove" }));
    dialog = screen.getByRole("dialog", { name: `Remove ${bo.name} from ${COMPANY.name}?` });
    fireEvent.keyDown(dialog, { key: "Escape" });
    expect(screen.queryByRole("dialog")).toBeNull();

    fireEvent.click(within(boRow).getByRole("button", { name: "Remove" }));
    dialog = screen.getByRole("dialog", { name: `Remove ${bo.name} from ${COMPANY.name}?` });
    fireEvent.click(within(dialog).getByRole("button", { name: "Remove" }));
    await waitFor(() => expect(within(screen.getByRole("table", { name: "Members" })).queryByText(bo.name)).toBeNull());
    expect(api.callsTo(`DELETE /api/members/${bo.userId}`)).toHaveLength(1);
    expect(screen.queryByRole("dialog")).toBeNull();
  });

  it("lets the Owner invite someone, confirms it and refreshes the pending list", async () => {
    let invited = false;
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/members": { body: { members } },
      "GET /api/invitations": () => ({ body: { invitations: invited ? [pending] : [] } }),
      "POST /api/invitations": (call) => {
        invited = true;
        expect(call.body).toEqual({ email: "cleo@kestrel.example", role: "installer" });
        return { status: 201, body: pending };
      },
    });
    renderAt("/team");
    expect(await screen.findByRole("heading", { name: "Invite someone" })).toBeTruthy();
    expect(await screen.findByText(/No invitations are waiting/)).toBeTruthy();
    const role = screen.getByLabelText("Role") as HTMLSelectElement;
    expect(role.value).toBe("estimator");
    expect([...role.options].map((o) => o.textContent)).toEqual(["Estimator", "Installer", "Owner"]);

    fireEvent.change(screen.getByLabelText("E-mail"), { target: { value: "Cleo@Kestrel.example" } });
    fireEvent.change(role, { target: { value: "installer" } });
    fireEvent.click(screen.getByRole("button", { name: "Send invitation" }));

    expect(await screen.findByRole("status", { name: "Invitation sent to cleo@kestrel.example" })).toBeTruthy();
    const list = await within(screen.getByRole("region", { name: "Pending invitations" })).findByRole("list");
    expect(list.textContent).toContain("cleo@kestrel.example");
    expect(list.textContent).toContain("Installer");
    expect(within(list).getByRole("button", { name: "Withdraw" })).toBeTruthy();
    expect(api.callsTo("POST /api/invitations")).toHaveLength(1);
    expect(api.callsTo("GET /api/invitations").length).toBeGreaterThanOrEqual(2);
    // The form is ready for the next one.
    expect((screen.getByLabelText("E-mail") as HTMLInputElement).value).toBe("");
  });

  it("puts \"already a member\" beside the invite form's E-mail field", async () => {
    stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/members": { body: { members } },
      "GET /api/invitations": { body: { invitations: [] } },
      "POST /api/invitations": apiError(409, "conflict", "This person is already a member of the company", { field: "email" }),
    });
    renderAt("/team");
    fireEvent.change(await screen.findByLabelText("E-mail"), { target: { value: "bo@kestrel.example" } });
    fireEvent.click(screen.getByRole("button", { name: "Send invitation" }));
    const email = screen.getByLabelText("E-mail");
    await waitFor(() => expect(email.getAttribute("aria-invalid")).toBe("true"));
    const errorId = email.getAttribute("aria-describedby")?.split(" ")[0] ?? "";
    expect(document.getElementById(errorId)?.textContent).toContain("This person is already a member of the company");
  });

  it("withdraws a pending invitation", async () => {
    let withdrawn = false;
    const api = stubApi({
      "GET /api/auth/session": sessionAs("owner"),
      "GET /api/health": healthUp,
      "GET /api/members": { body: { members } },
      "GET /api/invitations": () => ({ body: { invitations: withdrawn ? [] : [pending] } }),
      [`DELETE /api/invitations/${pending.id}`]: () => {
        withdrawn = true;
        return { status: 204 };
      },
    });
    renderAt("/team");
    fireEvent.click(await screen.findByRole("button", { name: "Withdraw" }));
    expect(await screen.findByText(/No invitations are waiting/)).toBeTruthy();
    expect(api.callsTo(`DELETE /api/invitations/${pending.id}`)).toHaveLength(1);
  });
});
