import { describe, expect, it } from "vitest";
import { linkTokenSchema, SignUpInput } from "../../../shared/schemas/auth.js";
import { UpdateCompanyInput } from "../../../shared/schemas/company.js";

const SECRET = "A".repeat(43);

describe("the shared account schemas", () => {
  it("take only a real uuid as a link token's row id", () => {
    expect(linkTokenSchema.safeParse(`1a2b3c4d-5e6f-4a1b-8c2d-3e4f5a6b7c8d.${SECRET}`).success).toBe(true);
    for (const id of ["-".repeat(36), "a".repeat(36), "1a2b3c4d5e6f4a1b8c2d3e4f5a6b7c8d----", "1A2B3C4D-5E6F-4A1B-8C2D-3E4F5A6B7C8D"]) {
      expect(linkTokenSchema.safeParse(`${id}.${SECRET}`).success, id).toBe(false);
    }
  });

  it("count decimals of percentages as people type them, despite binary floating point", () => {
    // 2.01, 4.03, 8.06 and 8.11 are not exact in binary; each has two decimals.
    for (const taxRatePercent of [2.01, 4.03, 8.06, 8.11, 8.125, 99.999]) {
      expect(UpdateCompanyInput.safeParse({ taxRatePercent }).success, String(taxRatePercent)).toBe(true);
    }
    expect(UpdateCompanyInput.safeParse({ taxRatePercent: 8.1255 }).success).toBe(false);
    expect(UpdateCompanyInput.safeParse({ depositPercent: 33.33 }).success).toBe(true);
    expect(UpdateCompanyInput.safeParse({ depositPercent: 33.333 }).success).toBe(false);
  });

  it("refuse control characters in names, naming the field", () => {
    const result = SignUpInput.safeParse({ companyName: "Nul\u0000Co", name: "N", email: "n@example.test", password: "long-enough-pass" });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([["companyName", "company name contains a control character"]]);
  });
});
