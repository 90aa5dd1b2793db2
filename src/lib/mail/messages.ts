import { escapeHtml } from './html';
import { roleLabels } from '../server/viewer';
import type { Role } from '../../db/schema/companies';

/** The words of every e-mail the product sends, as plain text and simple HTML. */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

function compose(
  subject: string,
  paragraphs: string[],
  link: { url: string; label: string },
  footer: string,
): MailContent {
  const text = [...paragraphs, `${link.label}: ${link.url}`, footer].join('\n\n');
  const html =
    `<!doctype html><html><body style="font-family:sans-serif;color:#15232c">${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('')}` +
    `<p><a href="${escapeHtml(link.url)}" style="background:#1d6f6c;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p>` +
    `<p style="color:#66767f;font-size:12px">${escapeHtml(footer)}</p></body></html>`;
  return { subject, text, html };
}

const notYou = 'If you did not ask for this, you can ignore this message: nothing changes until the link is used.';

export function signInLinkMail(url: string, minutes: number): MailContent {
  return compose(
    'Your Heatlayer sign-in link',
    [`Use the button below to sign in to Heatlayer. The link works once, within ${minutes} minutes.`],
    { url, label: 'Sign in to Heatlayer' },
    notYou,
  );
}

export function passwordResetMail(url: string, minutes: number): MailContent {
  return compose(
    'Choose a new Heatlayer password',
    [
      `Someone (we hope you) asked to reset the password of your Heatlayer account. The link works once, within ${minutes} minutes, and signs you out everywhere else.`,
    ],
    { url, label: 'Choose a new password' },
    notYou,
  );
}

export function invitationMail(opts: {
  url: string;
  companyName: string;
  role: Role;
  inviterName: string | null;
  homeLabel: string | null;
  days: number;
}): MailContent {
  const who = opts.inviterName ? `${opts.inviterName} at ${opts.companyName}` : opts.companyName;
  const what =
    opts.role === 'householder'
      ? `${who} has invited you to follow your hot-water cylinder${opts.homeLabel ? ` at ${opts.homeLabel}` : ''} on Heatlayer: how much hot water is left, what it costs, and plain-language warnings.`
      : `${who} has invited you to join their team on Heatlayer as ${roleLabels[opts.role].toLowerCase()}.`;
  return compose(
    `Your invitation to Heatlayer from ${opts.companyName}`,
    [what, `The link works once, within ${opts.days} days.`],
    { url: opts.url, label: 'Accept the invitation' },
    'If you were not expecting this invitation, ignore this message and no account will be created.',
  );
}
