import nodemailer, { type Transporter } from "nodemailer";
import type { Env } from "../config/env.js";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments?: Array<{ filename: string; content: Buffer; contentType: string }>;
}

/** Sends mail; `send` rejects when the SMTP server refuses or cannot be reached. */
export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

export interface SmtpSettings {
  host: string;
  port: number;
  secure?: boolean;
  user?: string;
  password?: string;
  from: string;
}

export function createMailer(settings: SmtpSettings): Mailer {
  const transport: Transporter = nodemailer.createTransport({
    host: settings.host,
    port: settings.port,
    secure: settings.secure ?? false,
    // A local catcher speaks plain SMTP; a real relay on 587 upgrades with STARTTLS.
    ignoreTLS: settings.host === "127.0.0.1" || settings.host === "localhost",
    auth: settings.user ? { user: settings.user, pass: settings.password ?? "" } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: settings.from, ...mail });
    },
    close() {
      transport.close();
    },
  };
}

/** The mail settings from the environment; `catcherPort` is the local catcher's SMTP port when SMTP_HOST is unset. */
export function smtpSettingsFromEnv(env: Env, catcherPort?: number): SmtpSettings {
  if (env.SMTP_HOST) {
    return {
      host: env.SMTP_HOST,
      port: env.SMTP_PORT ?? (env.SMTP_SECURE === "true" ? 465 : 587),
      secure: env.SMTP_SECURE === "true",
      user: env.SMTP_USER,
      password: env.SMTP_PASSWORD,
      from: env.MAIL_FROM,
    };
  }
  return { host: "127.0.0.1", port: catcherPort ?? env.RUNWRIGHT_MAIL_SMTP_PORT, from: env.MAIL_FROM };
}

/** Stands in when no mail server is configured: every send fails with a clear message. */
export const unconfiguredMailer: Mailer = {
  async send() {
    throw new Error("No mail server is configured (set SMTP_HOST, or run npm start for the local catcher)");
  },
  close() {},
};
