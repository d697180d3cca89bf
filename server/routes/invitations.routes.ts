import { Router } from "express";
import { AcceptInvitationInput, InvitationLookupInput } from "../../shared/schemas/auth.js";
import { InviteInput } from "../../shared/schemas/team.js";
import { can, publicRoute, requireAuth } from "../auth/context.js";
import { signInAs } from "../auth/sign-in.js";
import { limitBy } from "../middleware/rate-limit.js";
import { presentInvitation, presentSession } from "../presenters/account.presenter.js";
import { acceptInvitation, inviteMember, listPendingInvitations, lookupInvitation, revokeInvitation } from "../services/invitation.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function invitationRoutes({ db, mailer, publicUrl, rateLimit }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("invitations:read"), async (req, res) => {
    const invitations = await listPendingInvitations(db, requireAuth(req).companyId);
    res.json({ invitations: invitations.map(presentInvitation) });
  });

  router.post("/", can("invitations:write"), async (req, res) => {
    const auth = requireAuth(req);
    const { email, role } = InviteInput.parse(req.body);
    const invitation = await inviteMember(db, {
      companyId: auth.companyId,
      invitedById: auth.userId,
      inviterName: auth.name,
      email,
      role,
      publicUrl,
      mailer,
    });
    res.status(201).json(presentInvitation(invitation));
  });

  router.delete("/:id", can("invitations:write"), async (req, res) => {
    await revokeInvitation(db, requireAuth(req).companyId, idParam(req.params.id, "Invitation"));
    res.status(204).end();
  });

  // The link's token travels in the body, never in a URL the server logs.
  router.post("/lookup", publicRoute, ...limitBy("invitation", rateLimit, ["ip"]), async (req, res) => {
    const { token } = InvitationLookupInput.parse(req.body);
    res.json(await lookupInvitation(db, token));
  });

  router.post("/accept", publicRoute, ...limitBy("invitation", rateLimit, ["ip"]), async (req, res) => {
    const input = AcceptInvitationInput.parse(req.body);
    const { userId, companyId } = await acceptInvitation(db, input);
    const auth = await signInAs(db, req, userId, companyId);
    res.status(201).json(presentSession(auth));
  });

  return router;
}
