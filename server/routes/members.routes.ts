import { Router } from "express";
import { ChangeRoleInput } from "../../shared/schemas/team.js";
import { can, requireAuth } from "../auth/context.js";
import { presentMember } from "../presenters/account.presenter.js";
import { changeRole, listMembers, removeMember } from "../services/member.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function memberRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("members:read"), async (req, res) => {
    const members = await listMembers(db, requireAuth(req).companyId);
    res.json({ members: members.map(presentMember) });
  });

  router.patch("/:userId", can("members:write"), async (req, res) => {
    const userId = idParam(req.params.userId, "Member");
    const { role } = ChangeRoleInput.parse(req.body);
    const auth = requireAuth(req);
    res.json(presentMember(await changeRole(db, auth.companyId, auth.userId, userId, role)));
  });

  router.delete("/:userId", can("members:write"), async (req, res) => {
    const userId = idParam(req.params.userId, "Member");
    const auth = requireAuth(req);
    await removeMember(db, auth.companyId, auth.userId, userId);
    res.status(204).end();
  });

  return router;
}
