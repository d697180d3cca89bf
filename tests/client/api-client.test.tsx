import { afterEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { ApiError, apiFieldErrors, apiRequest } from "../../src/lib/api-client";
import { apiError, stubApi } from "./api-stub";

afterEach(() => vi.unstubAllGlobals());

describe("the API client", () => {
  it("sends X-Runwright-Request: 1 and the JSON body on a POST", async () => {
    const api = stubApi({ "POST /api/things": { status: 201, body: { id: "t1" } } });
    const answer = await apiRequest("/things", z.object({ id: z.string() }), { method: "POST", body: { name: "bus bar" } });
    expect(answer).toEqual({ id: "t1" });
    const [call] = api.callsTo("POST /api/things");
    expect(call.headers.get("X-Runwright-Request")).toBe("1");
    expect(call.headers.get("Content-Type")).toBe("application/json");
    expect(call.body).toEqual({ name: "bus bar" });
  });

  it("throws the server's error with its field details", async () => {
    stubApi({ "POST /api/things": apiError(400, "invalid_input", "name: name is required", { fields: { name: "name is required" } }) });
    const failure = await apiRequest("/things", z.object({}), { method: "POST", body: {} }).catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(ApiError);
    expect((failure as ApiError).status).toBe(400);
    expect(apiFieldErrors(failure as ApiError)).toEqual({ name: "name is required" });
  });

  it("names the one field a conflict is about", () => {
    const conflict = new ApiError(409, "conflict", "An account with this e-mail already exists", { field: "email" });
    expect(apiFieldErrors(conflict)).toEqual({ email: "An account with this e-mail already exists" });
  });
});
