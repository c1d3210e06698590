/**
 * Outgoing mail: one nodemailer transport built from EMAIL_SERVER (a URL string, gotcha G6)
 * and the two messages the app sends. Every message has a plain-text part that carries the
 * link on a line of its own, so a person and a test can both follow it.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from './env';

/** A message ready for `sendMail`. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
}

let transport: Transporter | null = null;

function getTransport(): Transporter {
  transport ??= nodemailer.createTransport(env().EMAIL_SERVER);
  return transport;
}

/** Send `message` from EMAIL_FROM; resolves when the SMTP server has accepted it. */
export async function sendMail(message: MailMessage): Promise<void> {
  await getTransport().sendMail({ from: env().EMAIL_FROM, ...message });
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

function html(paragraphs: string[], url: string, button: string): string {
  const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('');
  return `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a">${body}<p><a href="${escapeHtml(url)}">${escapeHtml(button)}</a></p><p style="color:#64748b;font-size:12px">${escapeHtml(url)}</p></body></html>`;
}

/**
 * A notification (review asked for or decided, a mention, an offer back): the lines, then the
 * link to the exact place on its own line, then a footer saying where to turn the kind off.
 */
export function notificationMessage(opts: { to: string; subject: string; lines: string[]; url: string; button: string; settingsUrl: string }): MailMessage {
  const footer = `You get this mail because of your Kilorung notification settings: ${opts.settingsUrl}`;
  return {
    to: opts.to,
    subject: opts.subject,
    text: `${opts.lines.join('\n')}\n\n${opts.url}\n\n${footer}\n`,
    html: html([...opts.lines], opts.url, opts.button).replace('</body>', `<p style="color:#64748b;font-size:12px">${escapeHtml(footer)}</p></body>`),
  };
}

/** The sign-in link mail (next-auth e-mail provider). `url` is the one-time callback link. */
export function signInLinkMessage(to: string, url: string): MailMessage {
  const lines = ['Use this link to sign in to Kilorung. It works once and expires in 24 hours.', "If you did not ask for it, ignore this mail."];
  return {
    to,
    subject: 'Your Kilorung sign-in link',
    text: `${lines[0]}\n\n${url}\n\n${lines[1]}\n`,
    html: html(lines, url, 'Sign in to Kilorung'),
  };
}

/** The invitation mail with its accept link. `expiresAt` is shown as an ISO date. */
export function invitationMessage(opts: { to: string; url: string; teamName: string; inviterName: string; role: string; expiresAt: Date }): MailMessage {
  const lines = [
    `${opts.inviterName} invited you to join the team "${opts.teamName}" on Kilorung as ${opts.role}.`,
    `Open the link to accept. It expires on ${opts.expiresAt.toISOString().slice(0, 10)}.`,
  ];
  return {
    to: opts.to,
    subject: `Join ${opts.teamName} on Kilorung`,
    text: `${lines[0]}\n${lines[1]}\n\n${opts.url}\n`,
    html: html(lines, opts.url, 'Accept the invitation'),
  };
}
