import type { DataSource } from "typeorm";
import { Company } from "./entities/index.js";

// The demo is our own invented firm; any likeness to a real one is accidental.
export const DEMO_COMPANY_ID = "5e1d0000-0000-4000-8000-00000000d001";
export const DEMO_COMPANY_NAME = "Kestrel Bay DC Works (demo)";

/** Adds the demo company if it is not there. Safe to run on every start. */
export async function seedDemo(db: DataSource): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .createQueryBuilder()
      .insert()
      .into(Company)
      .values({ id: DEMO_COMPANY_ID, name: DEMO_COMPANY_NAME })
      .orIgnore()
      .execute();
  });
}
