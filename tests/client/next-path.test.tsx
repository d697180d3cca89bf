import { describe, expect, it } from "vitest";
import { nextPath } from "../../src/features/auth/utils/next-path";

const ORIGIN = "http://127.0.0.1:3000";
const from = (next: string) => nextPath(`?next=${encodeURIComponent(next)}`, ORIGIN);

describe("where sign-in goes next", () => {
  it("keeps a page of this site, with its query and fragment", () => {
    expect(from("/jobs")).toBe("/jobs");
    expect(from("/jobs?status=lead&page=2#top")).toBe("/jobs?status=lead&page=2#top");
    expect(from("/a/../team")).toBe("/team");
  });

  it("drops anything that would leave the site, however it is disguised", () => {
    for (const next of ["//evil.example/x", "/\\evil.example", "/\t/evil.example", "/\n/evil.example", "/\r\n/evil.example", "https://evil.example/", "javascript:alert(1)", "evil.example", ""]) {
      expect(from(next), JSON.stringify(next)).toBe("/");
    }
    expect(nextPath("", ORIGIN)).toBe("/");
  });
});
