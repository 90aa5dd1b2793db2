import { env } from '../server/env';
import { listCapturedMail, mailDir, type CapturedMail } from './capture';

/**
 * The captured mailbox exists only while mail goes to the local fake server (SMTP_URL unset):
 * then no message has left the machine and showing them to the company's admin is safe.
 */
export function capturedMailboxInUse(): boolean {
  return env().MAIL_CAPTURED;
}

/** Captured messages sent for one company, newest first. */
export function capturedMailFor(companyId: string, limit = 100): CapturedMail[] {
  return listCapturedMail(mailDir(env().HEATLAYER_DATA_DIR))
    .filter((m) => m.companyId === companyId)
    .slice(0, limit);
}
