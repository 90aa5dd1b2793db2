// Alert e-mails: severe alerts to the company's operators as soon as they open, a daily digest of
// the rest, and plain-language notices to householders for the kinds that concern them (unless
// they opted out). Every notice is claimed in the notification log before it is sent, so each goes
// out once however many processes run this; a failed send gives its claim back for the next run.
import {
  alertsAwaiting,
  claimNotification,
  companiesWithAlerts,
  digestContent,
  householdersToNotify,
  releaseNotification,
  staffWithRole,
  type NotifiableAlert,
} from '../../db/queries/alerts';
import { siteUrl } from '../accounts/invitations';
import { sendMail } from '../mail/send';
import { digestMail, householderMail, severeAlertsMail, type MailAlert } from './mail';
import { alertLabels, householderKinds } from './types';

const HOUR = 3_600_000;
/** Alerts older than this when first noticed (a backlog replayed, a restart) go only to the digest. */
const IMMEDIATE_WITHIN_MS = 24 * HOUR;
/** The digest goes out at the start of the working day (common practice), UTC. */
const DIGEST_HOUR_UTC = 7;

/** The tank view at the evidence's time. */
const tankUrl = (tankId: string, at: number) =>
  siteUrl(`/tanks/${tankId}?from=${new Date(at - 6 * HOUR).toISOString()}&to=${new Date(at + 6 * HOUR).toISOString()}`);
const toMail = (a: NotifiableAlert): MailAlert => ({
  kind: a.kind,
  severity: a.severity,
  serial: a.serial,
  homeLabel: a.homeLabel,
  openedAt: a.openedAt,
  resolvedAt: a.resolvedAt,
  evidence: a.evidence,
  url: tankUrl(a.tankId, a.evidence.at),
});

async function claimAll(claims: Parameters<typeof claimNotification>[0][]): Promise<typeof claims> {
  const won: typeof claims = [];
  for (const c of claims) if (await claimNotification(c)) won.push(c);
  return won;
}

async function send(
  claims: Parameters<typeof claimNotification>[0][],
  mail: Parameters<typeof sendMail>[0],
  log: (l: string) => void,
): Promise<boolean> {
  try {
    await sendMail(mail);
    return true;
  } catch (err) {
    for (const c of claims) await releaseNotification(c.dedupeKey);
    log(
      `[alerts] could not send "${mail.subject}" to ${mail.to} (will retry): ${err instanceof Error ? err.message : String(err)}`,
    );
    return false;
  }
}

/** One e-mail per operator listing the severe alerts opened since they were last told. */
export async function sendSevereNotices(now: number, log: (l: string) => void = console.log): Promise<number> {
  const pending = await alertsAwaiting('immediate', new Date(now - IMMEDIATE_WITHIN_MS));
  let sent = 0;
  const byCompany = new Map<string, NotifiableAlert[]>();
  for (const a of pending) byCompany.set(a.companyId, [...(byCompany.get(a.companyId) ?? []), a]);
  for (const [companyId, alerts] of byCompany) {
    for (const op of await staffWithRole(companyId, 'operator')) {
      const claims = await claimAll(
        alerts.map((a) => ({
          companyId,
          alertId: a.id,
          userId: op.userId,
          email: op.email,
          channel: 'immediate' as const,
          dedupeKey: `immediate:${a.id}:${op.userId}`,
          subject: `Severe: ${alertLabels[a.kind]} at ${a.serial}`,
        })),
      );
      const mine = alerts.filter((a) => claims.some((c) => c.alertId === a.id));
      if (mine.length === 0) continue;
      const mail = severeAlertsMail(
        mine[0]!.companyName,
        mine.map(toMail),
        siteUrl('/alerts?state=active&severity=critical'),
      );
      if (await send(claims, { to: op.email, companyId, ...mail }, log)) sent++;
    }
  }
  return sent;
}

/** Plain-language notices to each home's householders for the kinds that concern them. */
export async function sendHouseholderNotices(now: number, log: (l: string) => void = console.log): Promise<number> {
  const pending = await alertsAwaiting('householder', new Date(now - IMMEDIATE_WITHIN_MS), { kinds: householderKinds });
  let sent = 0;
  for (const a of pending) {
    const mail = householderMail(a.kind, siteUrl('/home'), siteUrl('/alerts/preferences'));
    if (!mail) continue;
    for (const h of await householdersToNotify(a.tankId)) {
      const claims = await claimAll([
        {
          companyId: a.companyId,
          alertId: a.id,
          userId: h.userId,
          email: h.email,
          channel: 'householder',
          dedupeKey: `householder:${a.id}:${h.userId}`,
          subject: mail.subject,
        },
      ]);
      if (claims.length && (await send(claims, { to: h.email, companyId: a.companyId, ...mail }, log))) sent++;
    }
  }
  return sent;
}

/** The daily digest of each company with alerts, once a day from DIGEST_HOUR_UTC on. */
export async function sendDigests(
  now: number,
  log: (l: string) => void = console.log,
  opts: { companyId?: string } = {},
): Promise<number> {
  const dayStart = Math.floor((now - DIGEST_HOUR_UTC * HOUR) / (24 * HOUR)) * 24 * HOUR;
  const to = new Date(dayStart + DIGEST_HOUR_UTC * HOUR);
  const from = new Date(to.getTime() - 24 * HOUR);
  const day = to.toISOString().slice(0, 10);
  let sent = 0;
  for (const c of await companiesWithAlerts()) {
    if (opts.companyId && c.id !== opts.companyId) continue;
    const { opened, stillOpen } = await digestContent(c.id, from, to);
    if (opened.length === 0 && stillOpen === 0) continue;
    const mail = digestMail(c.name, day, opened.map(toMail), stillOpen, siteUrl('/alerts'));
    for (const op of await staffWithRole(c.id, 'operator')) {
      const claims = await claimAll([
        {
          companyId: c.id,
          alertId: null,
          userId: op.userId,
          email: op.email,
          channel: 'digest',
          dedupeKey: `digest:${c.id}:${day}:${op.userId}`,
          subject: mail.subject,
        },
      ]);
      if (claims.length && (await send(claims, { to: op.email, companyId: c.id, ...mail }, log))) sent++;
    }
  }
  return sent;
}
