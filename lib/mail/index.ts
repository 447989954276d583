import nodemailer, { type Transporter } from "nodemailer";
import type Mail from "nodemailer/lib/mailer";
import { env } from "@/lib/env";

// One transport per process. Locally SMTP_URL points at the mail catcher started by `npm run demo` and the tests.
const globalForMail = globalThis as unknown as { kinarcMail?: Transporter };

function transport(): Transporter {
  globalForMail.kinarcMail ??= nodemailer.createTransport(env().SMTP_URL);
  return globalForMail.kinarcMail;
}

export type OutgoingMail = Pick<Mail.Options, "to" | "subject" | "text" | "html" | "attachments" | "icalEvent" | "replyTo">;

export async function sendMail(message: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: env().MAIL_FROM, ...message });
}

/** Escapes text for the HTML part of a message. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** A plain, accessible message layout shared by every Kinarc e-mail. */
export function renderMessage(opts: { heading: string; paragraphs: string[]; action?: { label: string; url: string }; footer?: string }) {
  const text = [
    opts.heading,
    "",
    ...opts.paragraphs.flatMap((p) => [p, ""]),
    ...(opts.action ? [`${opts.action.label}: ${opts.action.url}`, ""] : []),
    opts.footer ?? "Kinarc, on behalf of your hand therapy clinic.",
  ].join("\n");
  const html = `<!doctype html><html><body style="font-family:system-ui,sans-serif;color:#1d2a30;max-width:560px;margin:auto;padding:24px">
<h1 style="font-size:20px;color:#155952">${escapeHtml(opts.heading)}</h1>
${opts.paragraphs.map((p) => `<p style="line-height:1.5">${escapeHtml(p)}</p>`).join("\n")}
${opts.action ? `<p><a href="${escapeHtml(opts.action.url)}" style="display:inline-block;background:#1b6f67;color:#fff;padding:10px 18px;border-radius:8px;text-decoration:none">${escapeHtml(opts.action.label)}</a></p>` : ""}
<p style="font-size:12px;color:#6b7a80">${escapeHtml(opts.footer ?? "Kinarc, on behalf of your hand therapy clinic.")}</p>
</body></html>`;
  return { text, html };
}
