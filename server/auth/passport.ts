import passportModule from "passport";

export type Authenticator = InstanceType<typeof passportModule.Passport>;
import { Strategy as LocalStrategy } from "passport-local";
import type { DataSource } from "typeorm";
import { User } from "../db/entities/index.js";
import { verifyPassword } from "./passwords.js";

/**
 * A Passport instance of this app (not the module's global one, so several
 * apps in one process keep apart). The session holds only the user's id.
 */
export function createPassport(db: DataSource): Authenticator {
  const passport = new passportModule.Passport();
  passport.use(
    new LocalStrategy({ usernameField: "email", passwordField: "password", session: true }, (email, password, done) => {
      db.getRepository(User)
        .findOne({ where: { email: email.trim().toLowerCase() } })
        .then(async (user) => {
          // Verify even without a user, so both failures take as long.
          const ok = await verifyPassword(user?.passwordHash, password);
          done(null, ok && user ? { id: user.id } : false);
        })
        .catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: unknown, done) => done(null, typeof id === "string" ? { id } : false));
  return passport;
}
