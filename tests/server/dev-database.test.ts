import { chmodSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readEnv } from "../../server/config/env.js";
import { devClusterRoot } from "../../server/scripts/dev-database.js";

describe("where npm start keeps its cluster", () => {
  const checkout = mkdtempSync(path.join(os.tmpdir(), "runwright-checkout-")); // mode 700, like a fresh mktemp clone
  afterAll(() => rmSync(checkout, { recursive: true, force: true }));

  it("uses <checkout>/.data/postgres when the server's user can reach it", () => {
    chmodSync(checkout, 0o755);
    expect(devClusterRoot(readEnv({}), {}, checkout)).toBe(path.join(checkout, ".data", "postgres"));
  });

  it.runIf(process.getuid?.() === 0)("moves to a per-checkout folder under /var/tmp when, as root, the postgres user cannot", () => {
    chmodSync(checkout, 0o700);
    const root = devClusterRoot(readEnv({}), {}, checkout);
    expect(root).toMatch(/^\/var\/tmp\/runwright-[0-9a-f]{10}\/postgres$/);
    expect(devClusterRoot(readEnv({}), {}, checkout)).toBe(root); // the same checkout finds the same cluster again
  });

  it("keeps an explicit RUNWRIGHT_DATA_DIR even when unreachable (the start then says what to do)", () => {
    chmodSync(checkout, 0o700);
    const source = { RUNWRIGHT_DATA_DIR: path.join(checkout, "mine") };
    expect(devClusterRoot(readEnv(source), source, checkout)).toBe(path.join(checkout, "mine", "postgres"));
  });
});
