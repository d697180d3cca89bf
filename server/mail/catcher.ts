import { mkdirSync } from "node:fs";
import { isPortFree } from "../scripts/port-check.js";

export interface MailCatcher {
  smtpPort: number;
  webPort: number;
  /** The catcher's web inbox (and its REST API under /api/email). */
  webUrl: string;
  stop(): Promise<void>;
}

/**
 * Starts the local SMTP catcher (maildev, a development dependency) on
 * 127.0.0.1: it accepts every message and shows it in a web inbox, so no mail
 * leaves the machine during development and tests. Each catcher keeps its
 * messages in its own folder (maildev's default is one shared /tmp/maildev),
 * so a test run and a running app never touch each other's mail; npm start's
 * inbox survives restarts, capped at the newest 1,000 messages.
 */
export async function startMailCatcher(smtpPort: number, webPort: number, mailDirectory: string): Promise<MailCatcher> {
  for (const [port, variable] of [
    [smtpPort, "RUNWRIGHT_MAIL_SMTP_PORT"],
    [webPort, "RUNWRIGHT_MAIL_WEB_PORT"],
  ] as const) {
    if (!(await isPortFree("127.0.0.1", port))) {
      throw new MailCatcherPortError(`Port ${port} on 127.0.0.1 (the local mail catcher) is already in use; set ${variable} to another port, or SMTP_HOST to use a real mail server.`);
    }
  }
  const { MailDev } = await import("maildev");
  mkdirSync(mailDirectory, { recursive: true });
  const maildev = new MailDev({ smtp: smtpPort, ip: "127.0.0.1", web: webPort, webIp: "127.0.0.1", silent: true, mailDirectory, maxEmails: 1000 });
  await maildev.start();
  return {
    smtpPort,
    webPort,
    webUrl: `http://127.0.0.1:${webPort}`,
    stop: () => maildev.stop(),
  };
}

export class MailCatcherPortError extends Error {
  override name = "MailCatcherPortError";
}
