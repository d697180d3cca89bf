import { createHash, randomBytes, randomUUID, timingSafeEqual } from "node:crypto";

/**
 * E-mailed links carry `<row id>.<secret>`: the id finds the row, the secret
 * (256 random bits, base64url, 43 characters) proves the link. Only the
 * secret's SHA-256 is stored, and it is compared in constant time.
 */
export interface LinkToken {
  id: string;
  token: string;
  hash: string;
}

export function newLinkToken(): LinkToken {
  const id = randomUUID();
  const secret = randomBytes(32).toString("base64url");
  return { id, token: `${id}.${secret}`, hash: sha256(secret) };
}

/** Splits a token (already shape-checked by linkTokenSchema) into its row id and secret. */
export function splitLinkToken(token: string): { id: string; secret: string } {
  const dot = token.indexOf(".");
  return { id: token.slice(0, dot), secret: token.slice(dot + 1) };
}

export function secretMatches(secret: string, storedHash: string): boolean {
  const given = Buffer.from(sha256(secret), "hex");
  const stored = Buffer.from(storedHash, "hex");
  return given.length === stored.length && timingSafeEqual(given, stored);
}

function sha256(text: string): string {
  return createHash("sha256").update(text).digest("hex");
}
