import type { DataSource } from "typeorm";
import { hashPassword } from "../auth/passwords.js";
import { readFileSync } from "node:fs";
import { Client, Company, Job, LimitProfile, Membership, PriceItem, System, User } from "./entities/index.js";
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
  await seedDemoPriceList(db);
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

const DEMO_TERMS = [
  "Prices are in US dollars and include the materials and labour listed. Work outside this scope is quoted separately.",
  "A deposit is due on acceptance; the balance is due on completion. Materials remain ours until paid in full.",
  "Cable routes and lengths are as laid out in the voltage-drop check; a change of route may change the price.",
].join("\n");

/**
 * An invented price list in the demo company's currency (USD): copper cable per metre and per foot
 * (costs from the engine's example costs files), lugs per size, fuses and holders, two devices. Only
 * into a demo company with an empty price list, so edits and deletions stay.
 */
async function seedDemoPriceList(db: DataSource): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.query(`SELECT id FROM company WHERE id = $1 FOR UPDATE`, [DEMO_COMPANY_ID]);
    if (await tx.existsBy(PriceItem, { companyId: DEMO_COMPANY_ID })) return;
    const items: Array<Partial<PriceItem>> = [];
    const cents = (dollars: number) => Math.round(dollars * 100);
    for (const [file, unit] of [["costs-metric", "m"], ["costs-imperial", "ft"]] as const) {
      const costs = JSON.parse(readFileSync(new URL(`../../shared/engine/examples/${file}.json`, import.meta.url), "utf8")) as { items: Array<{ material?: string; size: string; cost: number }> };
      for (const c of costs.items) {
        const material = (c.material ?? "copper") as "copper" | "aluminum";
        const sizeCode = c.size.replace(" mm2", "").replace(" AWG", "G").replace("/", "-");
        items.push({ sku: `CU-${sizeCode}${unit === "ft" ? "-FT" : ""}`, description: `Tinned copper cable ${c.size.replace("mm2", "mm²")}, single conductor`, category: "cable", unit, unitCostMinor: cents(c.cost), cableSize: c.size, cableMaterial: material, conductors: 1 });
        items.push({ sku: `LUG-${sizeCode}`, description: `Tinned copper lug for ${c.size.replace("mm2", "mm²")}, crimped and heat-shrunk`, category: "termination", unit: "each", unitCostMinor: cents(c.cost > 5 ? 4.2 : c.cost > 1.5 ? 1.9 : 0.65), cableSize: c.size });
      }
    }
    for (const rating of [10, 15, 25, 50, 60, 80, 150]) {
      items.push({ sku: `FUSE-${rating}`, description: `${rating} A DC fuse, ${rating >= 60 ? "bolt-down, 10 kA interrupting" : "blade, 2 kA interrupting"}`, category: "fuse", unit: "each", unitCostMinor: cents(rating >= 60 ? 18.5 : 2.4), ratingA: rating });
    }
    items.push({ sku: "FH-INLINE", description: "Sealed fuse holder with cover", category: "fuse", unit: "each", unitCostMinor: cents(14.75) });
    items.push({ sku: "DEV-LED-PATH", description: "12 V LED path light, 4 W, bronze", category: "device", unit: "each", unitCostMinor: cents(38), sellPriceMinor: cents(64) });
    items.push({ sku: "DEV-DCDC-24-12", description: "24 V to 12 V DC-DC converter, 20 A", category: "device", unit: "each", unitCostMinor: cents(96) });
    items.push({ sku: "OTH-CONDUIT", description: "UV-rated flexible conduit", category: "other", unit: "m", unitCostMinor: cents(2.1) });
    // Lugs are deduplicated by size across the metric and imperial lists.
    const seen = new Set<string>();
    const unique = items.filter((i) => !seen.has(i.sku as string) && seen.add(i.sku as string));
    await tx.getRepository(PriceItem).insert(unique.map((i) => ({ ...i, companyId: DEMO_COMPANY_ID })) as never);
    await tx.query(`UPDATE company SET quote_terms = $2 WHERE id = $1 AND quote_terms = ''`, [DEMO_COMPANY_ID, DEMO_TERMS]);
  });
}
