import type { DataSource, EntityManager } from "typeorm";
import type { Role } from "../../shared/schemas/role.js";
import { Membership } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { companyScope } from "./tenancy.js";

export async function listMembers(db: DataSource, companyId: string): Promise<Membership[]> {
  return companyScope(db.manager, companyId).find(Membership, { relations: { user: true }, order: { createdAt: "ASC", user: { name: "ASC" } } });
}

// Locks every membership row of the company, so two Owners demoting each
// other at the same moment cannot both succeed and leave none.
async function lockMembers(tx: EntityManager, companyId: string): Promise<Membership[]> {
  return tx.find(Membership, { where: { companyId }, lock: { mode: "pessimistic_write" } });
}

// The actor's role is checked again under the lock: an Owner demoted a moment
// ago by someone else must not finish a change that was already on its way.
function actorGuard(members: Membership[], actorId: string): void {
  if (members.find((m) => m.userId === actorId)?.role !== "owner") {
    throw new AppError("forbidden", "Only the company's Owner can change the team");
  }
}

function lastOwnerGuard(members: Membership[], target: Membership, action: string): void {
  const owners = members.filter((m) => m.role === "owner");
  if (target.role === "owner" && owners.length === 1) {
    throw new AppError("conflict", `The company's last Owner cannot be ${action}; make someone else Owner first`);
  }
}

/** Changes a member's role (Owner only). The last Owner cannot be demoted. */
export async function changeRole(db: DataSource, companyId: string, actorId: string, userId: string, role: Role): Promise<Membership> {
  return db.transaction(async (tx) => {
    const members = await lockMembers(tx, companyId);
    actorGuard(members, actorId);
    const target = members.find((m) => m.userId === userId);
    if (!target) throw new AppError("not_found", "Member not found");
    if (role !== "owner") lastOwnerGuard(members, target, "made an " + (role === "estimator" ? "Estimator" : "Installer"));
    const scope = companyScope(tx, companyId);
    await scope.update(Membership, { userId }, { role });
    const [updated] = await scope.find(Membership, { where: { userId }, relations: { user: true } });
    return updated;
  });
}

/** Removes a member from the company (their account stays). The last Owner cannot be removed. */
export async function removeMember(db: DataSource, companyId: string, actorId: string, userId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const members = await lockMembers(tx, companyId);
    actorGuard(members, actorId);
    const target = members.find((m) => m.userId === userId);
    if (!target) throw new AppError("not_found", "Member not found");
    lastOwnerGuard(members, target, "removed");
    await companyScope(tx, companyId).delete(Membership, { userId });
  });
}
