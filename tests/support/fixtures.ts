import type { DataSource } from "typeorm";
import { expect } from "vitest";
import { ApiClient } from "./api.js";
import { addMember, signUpCompany, uniqueEmail, type SignedInOwner } from "./accounts.js";
import type { TestApp } from "./app.js";
import { waitForMail } from "./mail.js";
import { createJobWork, type JobWork } from "./jobs.js";
import { createQuoteWork, type QuoteWork } from "./quotes.js";
import { payDeposit } from "./stripe.js";

/** A company with one person of each role, a spare member to act on, and a pending invitation. */
export interface CompanyFixture {
  companyId: string;
  owner: SignedInOwner;
  estimator: SignedInOwner;
  installer: SignedInOwner;
  /** A member (estimator) for routes that act on a member. */
  spare: SignedInOwner;
  invitationId: string;
  anonymous: ApiClient;
  /** The company's clients, job, system, limit profile and attachment. */
  work: JobWork;
  /** Made on first call: a priced estimate for the job and a quote sent to a client (with its e-mailed link). */
  quotes: () => Promise<QuoteWork>;
  /** Made on first call: the sent quote accepted through its client link. */
  accepted: () => Promise<QuoteWork>;
  /** Made on first call: the accepted quote's deposit paid on the Stripe fake and recorded from its webhook. */
  paid: () => Promise<QuoteWork & { paymentId: string }>;
}

export async function companyFixture(db: DataSource, app: TestApp): Promise<CompanyFixture> {
  const owner = await signUpCompany(app);
  const [estimator, installer, spare] = [
    await addMember(db, app, owner.companyId, "estimator", "Esme Estimator"),
    await addMember(db, app, owner.companyId, "installer", "Ivo Installer"),
    await addMember(db, app, owner.companyId, "estimator", "Spare Member"),
  ];
  const email = uniqueEmail("pending");
  const invited = await owner.api.post("/api/invitations", { email, role: "installer" });
  expect(invited.status).toBe(201);
  await waitForMail(email);
  const work = await createJobWork(owner.api);
  let quotes: Promise<QuoteWork> | undefined;
  let accepted: Promise<QuoteWork> | undefined;
  let paid: Promise<QuoteWork & { paymentId: string }> | undefined;
  const fixture: CompanyFixture = {
    companyId: owner.companyId,
    owner,
    estimator,
    installer,
    spare,
    invitationId: invited.body.id,
    anonymous: new ApiClient(app.app),
    work,
    quotes: () => (quotes ??= createQuoteWork(owner.api, work.jobId, app.url)),
    accepted: () =>
      (accepted ??= fixture.quotes().then(async (q) => {
        const answer = await new ApiClient(app.app).post(`/api/quote-links/${q.token}/accept`, { name: "Fixture Client", agree: true });
        expect(answer.status, JSON.stringify(answer.body)).toBe(200);
        return q;
      })),
    paid: () =>
      (paid ??= fixture.accepted().then(async (q) => ({ ...q, paymentId: await payDeposit(app, owner.api, work.jobId, q.token, { accept: false }) }))),
  };
  return fixture;
}

/**
 * Every row that belongs to a company: the company row, its people's
 * accounts and sessions, and the rows of every table with a company_id
 * column (found from the catalogue, so new tables are included without
 * touching this).
 */
export async function companySnapshot(db: DataSource, companyId: string): Promise<Record<string, unknown[]>> {
  const tables: Array<{ table_name: string }> = await db.query(
    `SELECT table_name FROM information_schema.columns WHERE table_schema = 'public' AND column_name = 'company_id' ORDER BY table_name`,
  );
  const snapshot: Record<string, unknown[]> = {
    company: await db.query(`SELECT * FROM company WHERE id = $1`, [companyId]),
    // The company's people: their accounts and their sessions.
    app_user: await db.query(`SELECT u.* FROM app_user u JOIN membership m ON m.user_id = u.id WHERE m.company_id = $1 ORDER BY u.id`, [companyId]),
    user_session: await db.query(
      `SELECT s.sid, s.sess::text FROM user_session s JOIN membership m ON s.sess -> 'passport' ->> 'user' = m.user_id::text WHERE m.company_id = $1 ORDER BY s.sid`,
      [companyId],
    ),
  };
  for (const { table_name } of tables) {
    snapshot[table_name] = await db.query(`SELECT * FROM "${table_name}" WHERE company_id = $1 ORDER BY 1, 2`, [companyId]);
  }
  return snapshot;
}
