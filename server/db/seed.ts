import type { DataSource } from "typeorm";
import { hashPassword } from "../auth/passwords.js";
import { readFileSync } from "node:fs";
import { Client, Company, Job, LimitProfile, Membership, System, User } from "./entities/index.js";
import { ensureDefaultLimitProfiles } from "../services/limit-profile.service.js";
import { solveDocument, summarise } from "../services/system.service.js";
import type { SystemInput } from "../../shared/engine/schema.js";
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
    const fresh = !(await tx.existsBy(Company, { id: DEMO_COMPANY_ID }));
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
    // A company made before limit profiles existed got them from their migration.
    if (fresh) await ensureDefaultLimitProfiles(tx, DEMO_COMPANY_ID);
  });
  await seedDemoJobs(db);
}

const example = (name: string) => JSON.parse(readFileSync(new URL(`../../shared/engine/examples/${name}.json`, import.meta.url), "utf8")) as SystemInput;

/** The cabin as the demo estimator left it: feeders already up-sized, so every load passes. */
function demoCabin(): SystemInput {
  const doc = example("cabin-24v");
  const sizes: Record<string, string> = { "feed-shed": "50 mm2", "shed-pump": "50 mm2", "cabin-studio": "4 mm2" };
  return { ...doc, name: "Cabin 24 V house system", runs: doc.runs.map((r) => ({ ...r, size: sizes[r.id] ?? r.size })) };
}

const demoId = (n: number) => `5e1d0000-0000-4000-8000-0000000b${String(n).padStart(4, "0")}`;
export const DEMO_CLIENTS = [
  { id: demoId(1), name: "Juniper Holloway (demo client)", email: "juniper.holloway@client.test", phone: "+1 555 0177", billingAddress: "4 Larchwood Lane, Kestrel Bay (invented)" },
  { id: demoId(2), name: "Brackenridge Signal Co-op (demo client)", email: "works@brackenridge.test", phone: "+1 555 0190", billingAddress: "Unit 7, Old Quarry Road, Kestrel Bay (invented)" },
];
export const DEMO_JOBS = [
  {
    id: demoId(11),
    clientId: demoId(1),
    title: "Off-grid cabin: 24 V bank and well pump",
    siteAddress: "Larchwood cabin plot, Kestrel Bay uplands (invented)",
    status: "quoted" as const,
    notes: "Pump is 40 m from the bank; the client wants lights in the studio too.",
    system: { id: demoId(21), name: "Cabin 24 V house system", document: demoCabin },
  },
  {
    id: demoId(12),
    clientId: demoId(1),
    title: "Garden path lighting, 18 fixtures",
    siteAddress: "4 Larchwood Lane, Kestrel Bay (invented)",
    status: "lead" as const,
    notes: "First layout on 12 AWG as the client asked; the far fixtures are too dim. Auto-size before quoting.",
    system: { id: demoId(22), name: "Path lights 12 V daisy chain", document: () => ({ ...example("garden-12v"), name: "Path lights 12 V daisy chain" }) },
  },
  {
    id: demoId(13),
    clientId: demoId(2),
    title: "48 V telecom and security cabinet",
    siteAddress: "Relay hut, Old Quarry Road, Kestrel Bay (invented)",
    status: "won" as const,
    notes: "Radio, camera and switch on a 48 V rectifier with battery backup.",
    system: { id: demoId(23), name: "Cabinet 48 V DC plant", document: () => ({ ...example("telecom-48v"), name: "Cabinet 48 V DC plant" }) },
  },
];

/**
 * Two clients and three jobs of an invented practice, each with a system solved at seeding. Only
 * into a demo company that has no clients and no jobs yet, so what people change or delete in the
 * demo stays changed (only deleting every client and job brings the demo jobs back).
 */
async function seedDemoJobs(db: DataSource): Promise<void> {
  const estimator = DEMO_USERS.find((u) => u.role === "estimator")!.id;
  await db.transaction(async (tx) => {
    // Serialises two starts seeding at once.
    await tx.query(`SELECT id FROM company WHERE id = $1 FOR UPDATE`, [DEMO_COMPANY_ID]);
    if ((await tx.existsBy(Client, { companyId: DEMO_COMPANY_ID })) || (await tx.existsBy(Job, { companyId: DEMO_COMPANY_ID }))) return;
    const hasEstimator = await tx.existsBy(User, { id: estimator });
    const general = await tx.findOneBy(LimitProfile, { companyId: DEMO_COMPANY_ID, name: "General — 3 % branch, 5 % total" });
    for (const client of DEMO_CLIENTS) {
      await tx.createQueryBuilder().insert().into(Client).values({ ...client, companyId: DEMO_COMPANY_ID }).orIgnore().execute();
    }
    for (const { system, ...job } of DEMO_JOBS) {
      if (await tx.existsBy(Job, { id: job.id })) continue;
      const createdById = hasEstimator ? estimator : null;
      await tx.createQueryBuilder().insert().into(Job).values({ ...job, companyId: DEMO_COMPANY_ID, createdById }).orIgnore().execute();
      const document = system.document();
      const limitProfileId = general?.id ?? null;
      const result = await solveDocument(tx, DEMO_COMPANY_ID, limitProfileId, document);
      await tx.save(
        tx.create(System, {
          id: system.id,
          companyId: DEMO_COMPANY_ID,
          jobId: job.id,
          name: system.name,
          nominalVoltage: document.nominalVoltage,
          units: document.units,
          limitProfileId,
          document: document as unknown as Record<string, unknown>,
          lastSolve: summarise(result),
          updatedById: createdById,
        }),
      );
    }
  });
}
