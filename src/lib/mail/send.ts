import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '../server/env';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** The company the message is sent for; the captured-mail page shows an admin only their own. */
  companyId: string | null;
  /** Files sent with the message (e.g. a commissioning record). */
  attachments?: { filename: string; content: Buffer; contentType: string }[];
}

/** Header naming the company a message belongs to (an id, nothing secret). */
export const companyHeader = 'X-Heatlayer-Company';

let transport: Transporter | undefined;

/**
 * Sends through SMTP_URL: the local fake mail server unless a real provider is configured.
 * Nothing else differs between the two.
 */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  transport ??= nodemailer.createTransport(env().SMTP_URL);
  await transport.sendMail({
    from: env().MAIL_FROM,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    headers: mail.companyId ? { [companyHeader]: mail.companyId } : {},
    attachments: mail.attachments,
  });
}
