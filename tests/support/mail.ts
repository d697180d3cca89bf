import { expect, inject } from "vitest";
import { createMailer, type Mailer } from "../../server/mail/mailer.js";

export interface CaughtMail {
  id: string;
  subject: string;
  text: string;
  html: string;
  to: Array<{ address: string; name?: string }>;
  from: Array<{ address: string; name?: string }>;
  time: string;
}

/** A nodemailer transport to the run's mail catcher (real SMTP on 127.0.0.1). */
export function catcherMailer(): Mailer {
  const { smtpPort } = inject("mailCatcher");
  return createMailer({ host: "127.0.0.1", port: smtpPort, from: "Runwright tests <no-reply@runwright.test>" });
}

function inboxUrl(path: string): string {
  return `http://127.0.0.1:${inject("mailCatcher").webPort}${path}`;
}

/** Every message the catcher holds for one recipient, oldest first. */
export async function mailsTo(address: string): Promise<CaughtMail[]> {
  const response = await fetch(inboxUrl("/api/email"));
  expect(response.status).toBe(200);
  const all = (await response.json()) as CaughtMail[];
  return all.filter((m) => m.to.some((t) => t.address.toLowerCase() === address.toLowerCase())).sort((a, b) => a.time.localeCompare(b.time));
}

/** Waits (up to 10 s) until the catcher holds `count` messages for the address; returns the newest. */
export async function waitForMail(address: string, count = 1): Promise<CaughtMail> {
  const deadline = Date.now() + 10_000;
  for (;;) {
    const found = await mailsTo(address);
    if (found.length >= count) return found[found.length - 1];
    if (Date.now() > deadline) throw new Error(`the catcher holds ${found.length} of ${count} expected e-mail(s) to ${address} after 10 s`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** The first link in a message's plain text that starts with the base URL. */
export function linkIn(mail: CaughtMail, base: string): string {
  const match = mail.text.match(new RegExp(`${base.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\S+`));
  if (!match) throw new Error(`no link to ${base} in the e-mail "${mail.subject}"`);
  return match[0];
}

/** The token from a link's `#token=` fragment. */
export function tokenOf(link: string): string {
  const token = new URL(link).hash.replace(/^#token=/, "");
  expect(token.length).toBeGreaterThan(40);
  return token;
}
