// The e-mail that carries the commissioning record to the householder (the invitation to
// Heatlayer itself goes by the accounts invitation path, in its own message).
import { escapeHtml } from '../mail/html';
import type { MailContent } from '../mail/messages';
import { LEGIONELLA_GUIDANCE, SCALD_CAUTION } from './cautions';
import type { SignedRecord } from './record';

export function handoverMail(r: SignedRecord): MailContent {
  const paragraphs = [
    `Hello ${r.answers.home.contactName},`,
    `${r.companyName} has commissioned your hot-water cylinder (serial ${r.serial}) at ${r.answers.home.addressLine}, ${r.answers.home.town}. The commissioning record is attached as a PDF: keep it with the cylinder’s papers, and show it at its annual inspection.`,
    'A separate e-mail invites you to Heatlayer, where you can see how much hot water is left, boost it and follow its costs.',
    SCALD_CAUTION,
    LEGIONELLA_GUIDANCE,
  ];
  return {
    subject: `Your cylinder’s commissioning record from ${r.companyName}`,
    text: paragraphs.join('\n\n'),
    html: `<!doctype html><html><body style="font-family:sans-serif;color:#15232c">${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('')}</body></html>`,
  };
}
