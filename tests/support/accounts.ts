import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import { expect } from "vitest";
import { hashPassword } from "../../server/auth/passwords.js";
import { Membership, User } from "../../server/db/entities/index.js";
import type { Role } from "../../shared/schemas/role.js";
import { ApiClient } from "./api.js";
import type { TestApp } from "./app.js";

export const TEST_PASSWORD = "correct-horse-battery";

/** A unique e-mail for this test run (files share one database and one catcher). */
export function uniqueEmail(label: string): string {
  return `${label}-${randomUUID().slice(0, 8)}@example.test`;
}

export interface SignedInOwner {
  api: ApiClient;
  email: string;
  userId: string;
  companyId: string;
}

/** Signs up a new company through the API; returns its Owner's signed-in client. */
export async function signUpCompany(app: TestApp, companyName = `Test Co ${randomUUID().slice(0, 6)}`): Promise<SignedInOwner> {
  const api = new ApiClient(app.app);
  const email = uniqueEmail("owner");
  const response = await api.post("/api/auth/sign-up", { companyName, name: "Olive Owner", email, password: TEST_PASSWORD });
  expect(response.status).toBe(201);
  return { api, email, userId: response.body.user.id, companyId: response.body.company.id };
}

/** Adds a person with a role straight through the entities (setup only; the invitation flow has its own tests). */
export async function addMember(db: DataSource, app: TestApp, companyId: string, role: Role, name = `Member ${role}`): Promise<SignedInOwner> {
  const email = uniqueEmail(role);
  const user = await db.getRepository(User).save({ email, name, passwordHash: await hashPassword(TEST_PASSWORD) });
  await db.getRepository(Membership).insert({ companyId, userId: user.id, role });
  const api = new ApiClient(app.app);
  const response = await api.post("/api/auth/sign-in", { email, password: TEST_PASSWORD });
  expect(response.status).toBe(200);
  return { api, email, userId: user.id, companyId };
}
