import type { DataSource } from "typeorm";
import { hashPassword } from "../auth/passwords.js";
import { Company, Membership, User } from "./entities/index.js";
import type { Role } from "../../shared/schemas/role.js";

// The demo is our own invented firm; any likeness to a real one is accidental.
export const DEMO_COMPANY_ID = "5e1d0000-0000-4000-8000-00000000d001";
export const DEMO_COMPANY_NAME = "Kestrel Bay DC Works (demo)";

/** The demo sign-ins (README lists them; change them on any machine others can reach). */
export const DEMO_PASSWORD = "kestrel-demo-2026";
export const DEMO_USERS: Array<{ id: string; email: string; name: string; role: Role }> = [
  { id: "5e1d0000-0000-4000-8000-0000000a0001", email: "owner@kestrel-bay.test", name: "Demo Owner", role: "owner" },
  { id: "5e1d0000-0000-4000-8000-0000000a0002", email: "estimator@kestrel-bay.test", name: "Demo Estimator", role: "estimator" },
  { id: "5e1d0000-0000-4000-8000-0000000a0003", email: "installer@kestrel-bay.test", name: "Demo Installer", role: "installer" },
];

/** Adds the demo company and its three people if they are not there. Safe to run on every start; never overwrites. */
export async function seedDemo(db: DataSource): Promise<void> {
  const missing: typeof DEMO_USERS = [];
  for (const user of DEMO_USERS) {
    // Skipped when the id or the e-mail is taken (someone signed up with a demo address).
    const taken = await db.getRepository(User).existsBy([{ id: user.id }, { email: user.email }]);
    if (!taken) missing.push(user);
  }
  // Hash before the transaction (argon2: about 15 ms a password).
  const hashes = new Map<string, string>();
  for (const user of missing) hashes.set(user.id, await hashPassword(DEMO_PASSWORD));
  await db.transaction(async (tx) => {
    await tx
      .createQueryBuilder()
      .insert()
      .into(Company)
      .values({
        id: DEMO_COMPANY_ID,
        name: DEMO_COMPANY_NAME,
        licenceNumber: "DEMO-EC-0412",
        contactEmail: "office@kestrel-bay.test",
        phone: "+1 555 0142",
        address: "12 Harbour Rise, Kestrel Bay (invented)",
        currency: "USD",
        taxRatePercent: 8.25,
        defaultMarkupPercent: 20,
        labourRateMinor: 9500,
        depositPercent: 30,
      })
      .orIgnore()
      .execute();
    for (const user of missing) {
      await tx
        .createQueryBuilder()
        .insert()
        .into(User)
        .values({ id: user.id, email: user.email, name: user.name, passwordHash: hashes.get(user.id)! })
        .orIgnore()
        .execute();
      await tx.createQueryBuilder().insert().into(Membership).values({ companyId: DEMO_COMPANY_ID, userId: user.id, role: user.role }).orIgnore().execute();
    }
  });
}
