import { Router } from "express";
import type { Authenticator } from "../auth/passport.js";
import {
  ForgotPasswordInput,
  ResetPasswordInput,
  SignInInput,
  SignUpInput,
  SwitchCompanyInput,
} from "../../shared/schemas/auth.js";
import { loadAuthContext, publicRoute, signedIn } from "../auth/context.js";
import { SESSION_COOKIE } from "../auth/session.js";
import { signInAs, signOut } from "../auth/sign-in.js";
import { AppError } from "../errors.js";
import { limitBy } from "../middleware/rate-limit.js";
import { presentSession } from "../presenters/account.presenter.js";
import { signUp } from "../services/account.service.js";
import { completePasswordReset, requestPasswordReset } from "../services/password-reset.service.js";
import type { AccountDeps } from "./deps.js";

const WRONG = "E-mail or password is wrong";
export const RESET_REQUESTED = "If an account uses that e-mail, we have sent it a link to set a new password. The link works for one hour.";

export function authRoutes({ db, passport, mailer, publicUrl, logger, rateLimit }: AccountDeps & { passport: Authenticator }): Router {
  const router = Router();

  router.get("/session", publicRoute, (req, res) => {
    res.json(presentSession(req.auth));
  });

  // Sign-up must say when an e-mail already has an account (so the person signs in instead); the per-e-mail
  // limit keeps that from being used to test many addresses.
  router.post("/sign-up", publicRoute, ...limitBy("sign-up", rateLimit, ["ip", "email"]), async (req, res) => {
    const input = SignUpInput.parse(req.body);
    const user = await signUp(db, input);
    const auth = await signInAs(db, req, user.id);
    res.status(201).json(presentSession(auth));
  });

  router.post("/sign-in", publicRoute, ...limitBy("sign-in", rateLimit, ["ip", "email"]), async (req, res) => {
    const input = SignInInput.parse(req.body);
    req.body = input;
    const userId = await new Promise<string | false>((resolve, reject) => {
      passport.authenticate("local", { session: false }, (error: unknown, user: Express.User | false) => {
        if (error) reject(error);
        else resolve(user ? user.id : false);
      })(req, res, (error: unknown) => reject(error));
    });
    if (!userId) throw new AppError("unauthenticated", WRONG);
    const auth = await signInAs(db, req, userId);
    // An account with no company left cannot work anywhere: same answer as a wrong password.
    if (!auth) {
      await signOut(req);
      throw new AppError("unauthenticated", WRONG);
    }
    res.json(presentSession(auth));
  });

  router.post("/sign-out", publicRoute, async (req, res) => {
    await signOut(req);
    res.clearCookie(SESSION_COOKIE, { path: "/" });
    res.status(204).end();
  });

  router.post("/switch-company", signedIn, async (req, res) => {
    const { companyId } = SwitchCompanyInput.parse(req.body);
    const auth = req.auth!;
    if (!auth.memberships.some((m) => m.companyId === companyId)) throw new AppError("not_found", "Company not found");
    req.session.companyId = companyId;
    res.json(presentSession(await loadAuthContext(db, auth.userId, companyId)));
  });

  router.post("/forgot-password", publicRoute, ...limitBy("password reset", rateLimit, ["ip", "email"]), async (req, res) => {
    const { email } = ForgotPasswordInput.parse(req.body);
    // Answer first, then look the address up: known and unknown addresses take the same time.
    res.status(202).json({ message: RESET_REQUESTED });
    setImmediate(() => void requestPasswordReset(db, email, publicUrl, mailer, logger));
  });

  router.post("/reset-password", publicRoute, ...limitBy("password reset", rateLimit, ["ip"]), async (req, res) => {
    const { token, password } = ResetPasswordInput.parse(req.body);
    const userId = await completePasswordReset(db, token, password, req.sessionID);
    const auth = await signInAs(db, req, userId);
    // signInAs regenerates the session: the old row goes, so only this new session remains.
    res.json(presentSession(auth));
  });

  return router;
}
