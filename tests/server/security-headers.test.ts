// helmet's headers on every kind of answer, with a content security policy that names no host but
// the app's own origin: the app ships its fonts, scripts and styles itself (tests/e2e/build-hosts
// checks the built files for other hosts).
import request from "supertest";
import { describe, expect, inject, it } from "vitest";
import { useTestApp } from "../support/app.js";

/** The policy as directive → sources. */
function policy(header: string | undefined): Map<string, string[]> {
  expect(header, "no Content-Security-Policy header").toBeTruthy();
  return new Map(
    header!
      .split(";")
      .map((d) => d.trim().split(/\s+/))
      .filter((parts) => parts[0])
      .map(([name, ...sources]) => [name, sources]),
  );
}

// The only sources allowed: the app's own origin, nothing, inline styles (React's style attributes),
// and data:/blob: URLs the app makes itself (the logo preview, downloads).
const ALLOWED = new Set(["'self'", "'none'", "'unsafe-inline'", "data:", "blob:"]);

describe("security headers", () => {
  const t = useTestApp({ clientDir: inject("clientDir") });

  it("allows only the app's own origin, on the app shell, the API, a PDF and an error", async () => {
    const paths = ["/", "/jobs", "/q/not-a-real-token", "/api/health", "/api/jobs", "/api/nowhere", "/api/quote-links/x.y/pdf"];
    for (const path of paths) {
      const res = await request(t.app.app).get(path);
      const csp = policy(res.headers["content-security-policy"]);
      for (const [directive, sources] of csp) {
        if (directive === "upgrade-insecure-requests" || directive === "block-all-mixed-content") continue;
        for (const source of sources) expect(ALLOWED.has(source), `${path}: ${directive} allows ${source}`).toBe(true);
      }
      expect(csp.get("default-src")).toEqual(["'self'"]);
      expect(csp.get("script-src")).toEqual(["'self'"]);
      expect(csp.get("object-src")).toEqual(["'none'"]);
      expect(csp.get("frame-ancestors")).toEqual(["'self'"]);
      expect(csp.get("form-action")).toEqual(["'self'"]);
      // Scripts: no inline scripts, no eval.
      expect(csp.get("script-src")).not.toContain("'unsafe-inline'");
      expect(res.headers["x-content-type-options"]).toBe("nosniff");
      expect(res.headers["x-frame-options"]).toBe("SAMEORIGIN");
      expect(res.headers["referrer-policy"]).toBe("no-referrer");
      expect(res.headers["cross-origin-opener-policy"]).toBe("same-origin");
      expect(res.headers["x-powered-by"]).toBeUndefined();
    }
  });
});
