// Reading what the fake mail server captured (files under $HEATLAYER_DATA_DIR/mail).
import { listCapturedMail, mailDir, type CapturedMail } from '../../src/lib/mail/capture';

function capturedMailDir(): string {
  const dataDir = process.env.HEATLAYER_DATA_DIR;
  if (!dataDir) throw new Error('HEATLAYER_DATA_DIR is not set: run the tests through `npm test`.');
  return mailDir(dataDir);
}

export function mailTo(address: string): CapturedMail[] {
  return listCapturedMail(capturedMailDir()).filter((m) => m.to.includes(address.toLowerCase()));
}

/** Waits for a new message to `address` (received after `since`) whose subject matches. */
export async function waitForMail(
  address: string,
  subject: RegExp,
  since: Date,
  timeoutMs = 10_000,
): Promise<CapturedMail> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const found = mailTo(address).find((m) => subject.test(m.subject) && new Date(m.receivedAt) >= since);
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No message to ${address} matching ${subject} arrived within ${timeoutMs / 1000} s.`);
}

/** The first link in a message that starts with `prefix` (e.g. the site's address). */
export function linkIn(mail: CapturedMail, prefix: string): string {
  const link = mail.links.find((l) => l.startsWith(prefix));
  if (!link) throw new Error(`The message "${mail.subject}" has no link starting ${prefix}: ${mail.links.join(', ')}`);
  return link;
}
