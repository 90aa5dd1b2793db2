import { randomUUID } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { companyHeader } from './send';

/**
 * The local fake mail server for development and tests: accepts every message on loopback and
 * keeps it as a JSON file (plus the raw .eml) under <data dir>/mail, where tests read links out
 * of it and /dev/mail lists it. It offers neither AUTH nor STARTTLS: Auth.js's e-mail provider
 * sends empty credentials and would fail on an AUTH prompt.
 */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  companyId: string | null;
  /** Every http(s) link in the text body, in order. */
  links: string[];
}

export function mailDir(dataDir: string): string {
  return resolve(dataDir, 'mail');
}

export function startCaptureServer(opts: { host: string; port: number; dir: string }): Promise<SMTPServer> {
  mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    hideSTARTTLS: true,
    logger: false,
    size: 5 * 1024 * 1024,
    async onData(stream, session, done) {
      try {
        const chunks: Buffer[] = [];
        for await (const c of stream) chunks.push(c as Buffer);
        const raw = Buffer.concat(chunks);
        const parsed = await simpleParser(raw);
        const text = parsed.text ?? '';
        const header = parsed.headers.get(companyHeader.toLowerCase());
        const mail: CapturedMail = {
          id: `${Date.now().toString(36)}-${randomUUID().slice(0, 8)}`,
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
          subject: parsed.subject ?? '',
          text,
          html: typeof parsed.html === 'string' ? parsed.html : null,
          companyId: typeof header === 'string' ? header : null,
          links: [...text.matchAll(/https?:\/\/[^\s<>"]+/g)].map((m) => m[0]),
        };
        writeFileSync(join(opts.dir, `${mail.id}.eml`), raw);
        // Write then rename, so a reader never sees half a file.
        const tmp = join(opts.dir, `.${mail.id}.json.tmp`);
        writeFileSync(tmp, JSON.stringify(mail, null, 2));
        renameSync(tmp, join(opts.dir, `${mail.id}.json`));
        done();
      } catch (err) {
        done(err as Error);
      }
    },
  });
  return new Promise((resolvePromise, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host, () => resolvePromise(server));
  });
}

/** Captured messages, newest first. */
export function listCapturedMail(dir: string): CapturedMail[] {
  let names: string[];
  try {
    names = readdirSync(dir).filter((n) => n.endsWith('.json') && !n.startsWith('.'));
  } catch {
    return [];
  }
  return names
    .sort()
    .reverse()
    .map((n) => JSON.parse(readFileSync(join(dir, n), 'utf8')) as CapturedMail);
}
