import { ROLE_LABELS, type Role } from "../../shared/schemas/role.js";
import type { OutgoingMail } from "./mailer.js";

// Our own templates: a plain-text part for every mail client and a simple
// inline-styled HTML part (mail clients ignore style sheets).

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);
}

function layout(companyName: string, paragraphs: string[], button: { label: string; url: string } | null, footer: string): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 14px">${escapeHtml(p)}</p>`).join("");
  return `<!doctype html>
<html><body style="margin:0;background:#f4f6f8;font-family:Arial,Helvetica,sans-serif;color:#19222a">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border-radius:8px;border-top:4px solid #b86632">
<tr><td style="padding:24px 28px 8px;font-size:18px;font-weight:bold">${escapeHtml(companyName)}</td></tr>
<tr><td style="padding:8px 28px 8px;font-size:15px;line-height:22px">${body}
${
    button
      ? `<p style="margin:20px 0"><a href="${escapeHtml(button.url)}" style="background:#19222a;color:#ffffff;padding:10px 18px;border-radius:6px;text-decoration:none;font-weight:bold">${escapeHtml(button.label)}</a></p>
<p style="margin:0 0 14px;font-size:13px;color:#5d6d7a">If the button does not work, copy this address into your browser:<br>${escapeHtml(button.url)}</p>`
      : ""
  }
</td></tr>
<tr><td style="padding:12px 28px 24px;font-size:12px;color:#7f8e9b">${escapeHtml(footer)}</td></tr>
</table></td></tr></table></body></html>`;
}

export function invitationMail(input: { to: string; companyName: string; inviterName: string; role: Role; url: string; expiresAt: Date }): OutgoingMail {
  const role = ROLE_LABELS[input.role];
  const until = input.expiresAt.toUTCString();
  const lines = [
    `${input.inviterName} has invited you to join ${input.companyName} on Runwright as an ${role}.`,
    `Runwright is where ${input.companyName} lays out, checks and prices its DC installations.`,
    `The link works once and until ${until}.`,
  ];
  const footer = "If you did not expect this invitation, you can ignore this e-mail; nothing happens until the link is used.";
  return {
    to: input.to,
    subject: `You're invited to join ${input.companyName} on Runwright`,
    text: `${lines.join("\n\n")}\n\nAccept the invitation:\n${input.url}\n\n${footer}\n`,
    html: layout(input.companyName, lines, { label: "Accept the invitation", url: input.url }, footer),
  };
}

export function passwordResetMail(input: { to: string; companyName: string; name: string; url: string }): OutgoingMail {
  const lines = [
    `Hello ${input.name},`,
    `Someone asked to set a new password for your Runwright account at ${input.companyName}.`,
    "The link works once and for one hour. Setting a new password signs you out everywhere else.",
  ];
  const footer = "If you did not ask for this, ignore this e-mail: your password stays as it is.";
  return {
    to: input.to,
    subject: `Set a new Runwright password (${input.companyName})`,
    text: `${lines.join("\n\n")}\n\nSet a new password:\n${input.url}\n\n${footer}\n`,
    html: layout(input.companyName, lines, { label: "Set a new password", url: input.url }, footer),
  };
}

export function quoteMail(input: { to: string; companyName: string; clientName: string; label: string; jobTitle: string; total: string; deposit: string; validUntil: string; url: string; message?: string; senderName: string }): OutgoingMail {
  const lines = [
    `Hello ${input.clientName},`,
    ...(input.message ? [input.message] : []),
    `${input.companyName} has sent you quote ${input.label} for ${input.jobTitle}: ${input.total} in total, with a deposit of ${input.deposit} due on acceptance.`,
    "The quote is attached as a PDF, with the voltage-drop check of every load. You can read it, accept it or decline it online.",
    `The quote is valid until ${input.validUntil}.`,
  ];
  const footer = `Sent by ${input.senderName} for ${input.companyName} through Runwright. Reply to this e-mail with any questions.`;
  return {
    to: input.to,
    subject: `Quote ${input.label} from ${input.companyName}: ${input.jobTitle}`,
    text: `${lines.join("\n\n")}\n\nOpen the quote:\n${input.url}\n\n${footer}\n`,
    html: layout(input.companyName, lines, { label: "Open the quote", url: input.url }, footer),
  };
}

export function quoteAnsweredMail(input: { to: string; companyName: string; label: string; jobTitle: string; clientName: string; answer: "accepted" | "declined"; byName: string | null; reason: string | null; url: string }): OutgoingMail {
  const lines =
    input.answer === "accepted"
      ? [`${input.clientName} accepted quote ${input.label} (${input.jobTitle}).`, `Accepted by: ${input.byName ?? "the client"}.`, "The client can now pay the deposit from the quote page."]
      : [`${input.clientName} declined quote ${input.label} (${input.jobTitle}).`, input.reason ? `Their reason: ${input.reason}` : "They gave no reason."];
  const footer = "You get this e-mail because you sent this quote from Runwright.";
  return {
    to: input.to,
    subject: `Quote ${input.label} ${input.answer} by ${input.clientName}`,
    text: `${lines.join("\n\n")}\n\nOpen the quote in Runwright:\n${input.url}\n\n${footer}\n`,
    html: layout(input.companyName, lines, { label: "Open the quote", url: input.url }, footer),
  };
}

export function depositReceiptMail(input: {
  to: string;
  companyName: string;
  companyContact: string;
  clientName: string;
  label: string;
  jobTitle: string;
  amount: string;
  paidAt: Date;
  receiptNumber: string;
  balance: string;
}): OutgoingMail {
  const lines = [
    `Hello ${input.clientName},`,
    `Thank you: ${input.companyName} has received your deposit of ${input.amount} on quote ${input.label} (${input.jobTitle}).`,
    `Paid on ${input.paidAt.toISOString().slice(0, 10)}. Receipt number: ${input.receiptNumber}. The receipt is attached as a PDF.`,
    `Balance still to pay under the quote's terms: ${input.balance}.`,
    ...(input.companyContact ? [`Questions? Contact ${input.companyName}: ${input.companyContact}.`] : []),
  ];
  const footer = `Sent for ${input.companyName} through Runwright. The payment was taken by Stripe; your card details never reached ${input.companyName}.`;
  return {
    to: input.to,
    subject: `Receipt ${input.receiptNumber}: deposit of ${input.amount} received by ${input.companyName}`,
    text: `${lines.join("\n\n")}\n\n${footer}\n`,
    html: layout(input.companyName, lines, null, footer),
  };
}

export function depositNoticeMail(input: { to: string; companyName: string; label: string; jobTitle: string; clientName: string; amount: string; mismatchReason: string | null; url: string }): OutgoingMail {
  const lines = input.mismatchReason
    ? [
        `A payment of ${input.amount} arrived for quote ${input.label} (${input.jobTitle}) from ${input.clientName}, but it does not match the deposit due.`,
        `Why it was flagged: ${input.mismatchReason}.`,
        "It has not been counted as the deposit. Check it on the quote page, and refund it if it should not have been paid.",
      ]
    : [`${input.clientName} paid the deposit of ${input.amount} on quote ${input.label} (${input.jobTitle}).`, "The client has been sent a receipt. The job is ready to schedule."];
  const footer = "You get this e-mail because you sent this quote from Runwright.";
  return {
    to: input.to,
    subject: input.mismatchReason ? `Check a payment on quote ${input.label}: ${input.amount} from ${input.clientName}` : `Deposit paid on quote ${input.label}: ${input.amount} from ${input.clientName}`,
    text: `${lines.join("\n\n")}\n\nOpen the quote in Runwright:\n${input.url}\n\n${footer}\n`,
    html: layout(input.companyName, lines, { label: "Open the quote", url: input.url }, footer),
  };
}
