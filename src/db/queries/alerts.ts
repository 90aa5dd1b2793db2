// Alerts: thresholds, the inbox's list and actions, notification preferences and the notification
// log. The rows the rules' evaluation reads and writes are in alert-evaluation.ts.
import { sql, type SQL } from 'drizzle-orm';
import { db } from '..';
import type { Scope } from '../../lib/server/authz';
import { resolveThresholds, type ThresholdOverrides, type Thresholds } from '../../lib/alerts/thresholds';
import type { AlertEvidence, AlertKind, AlertSeverity, AlertState } from '../../lib/alerts/types';
import type { NotificationChannel } from '../schema/alerts';
import { isUuid, scopeWhere } from './scope';

// ---------------------------------------------------------------- thresholds (cached briefly: the worker reads them per batch)

const thresholdCache = new Map<string, { at: number; th: Thresholds }>();
const THRESHOLD_TTL_MS = 30_000;

export async function getThresholdOverrides(companyId: string): Promise<Record<string, unknown>> {
  const res = await db().execute<{ settings: Record<string, unknown> }>(
    sql`select settings from alert_thresholds where company_id = ${companyId}`,
  );
  return res.rows[0]?.settings ?? {};
}

export async function thresholdsFor(companyId: string): Promise<Thresholds> {
  const hit = thresholdCache.get(companyId);
  if (hit && Date.now() - hit.at < THRESHOLD_TTL_MS) return hit.th;
  const th = resolveThresholds(await getThresholdOverrides(companyId));
  thresholdCache.set(companyId, { at: Date.now(), th });
  return th;
}

/** Stores a company's changes (already validated) in place of the previous ones. */
export async function saveThresholdOverrides(
  companyId: string,
  overrides: ThresholdOverrides,
  userId: string,
): Promise<void> {
  await db().execute(sql`
    insert into alert_thresholds (company_id, settings, updated_at, updated_by) values (${companyId}, ${JSON.stringify(overrides)}::jsonb, now(), ${userId})
    on conflict (company_id) do update set settings = excluded.settings, updated_at = now(), updated_by = excluded.updated_by`);
  thresholdCache.delete(companyId);
}

/** Tanks that have reported, optionally of one company, with whether readings wait for the rules. */
export async function tanksForClock(companyId?: string): Promise<{ id: string; behind: boolean }[]> {
  const res = await db().execute<{ id: string; behind: boolean }>(sql`
    select t.id, coalesce(l.ts > s.evaluated_to or s.evaluated_to is null, false) as behind
    from tanks t join tank_latest_state l on l.tank_id = t.id and l.ts is not null
    left join alert_tank_state s on s.tank_id = t.id
    ${companyId ? sql`where t.company_id = ${companyId}` : sql``}`);
  return res.rows;
}

/** Tank ids by serial (the ingest worker's batches name tanks by serial). */
export async function tankIdsBySerial(serials: readonly string[]): Promise<{ id: string; serial: string }[]> {
  if (serials.length === 0) return [];
  const res = await db().execute<{ id: string; serial: string }>(
    sql`select id, serial from tanks where serial = any(string_to_array(${serials.join(',')}, ','))`,
  );
  return res.rows;
}

// ---------------------------------------------------------------- the inbox

const alertsPageSize = 50;

export interface AlertFilters {
  kind?: AlertKind;
  severity?: AlertSeverity;
  state?: AlertState | 'active';
  assignee?: string | 'none';
  town?: string;
  tankId?: string;
  page?: number;
}

export interface AlertListItem {
  id: string;
  kind: AlertKind;
  severity: AlertSeverity;
  state: AlertState;
  evidence: AlertEvidence;
  openedAt: string;
  acknowledgedAt: string | null;
  acknowledgedBy: string | null;
  resolvedAt: string | null;
  resolvedBy: string | null;
  autoResolved: boolean;
  note: string | null;
  assignee: { id: string; name: string | null; email: string } | null;
  tank: { id: string; serial: string };
  home: { id: string; reference: string; town: string; addressLine: string } | null;
}

type AlertRowSql = {
  id: string;
  kind: AlertKind;
  severity: AlertSeverity;
  state: AlertState;
  evidence: AlertEvidence;
  opened_at: Date;
  acknowledged_at: Date | null;
  ack_name: string | null;
  resolved_at: Date | null;
  res_name: string | null;
  resolved_by: string | null;
  note: string | null;
  assignee_id: string | null;
  assignee_name: string | null;
  assignee_email: string | null;
  tank_id: string;
  serial: string;
  home_id: string | null;
  reference: string | null;
  town: string | null;
  address_line: string | null;
  total: string;
};

/** The tenancy filter for alerts `a` of tanks `t`; the alert's own company column lets its index serve the list. */
const alertInScope = (scope: Scope): SQL => sql`a.company_id = ${scope.companyId} and ${scopeWhere(scope)}`;

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

function toItem(r: AlertRowSql): AlertListItem {
  return {
    id: r.id,
    kind: r.kind,
    severity: r.severity,
    state: r.state,
    evidence: r.evidence,
    openedAt: iso(r.opened_at)!,
    acknowledgedAt: iso(r.acknowledged_at),
    acknowledgedBy: r.ack_name,
    resolvedAt: iso(r.resolved_at),
    resolvedBy: r.res_name,
    autoResolved: r.resolved_at !== null && r.resolved_by === null,
    note: r.note,
    assignee: r.assignee_id ? { id: r.assignee_id, name: r.assignee_name, email: r.assignee_email! } : null,
    tank: { id: r.tank_id, serial: r.serial },
    home: r.home_id ? { id: r.home_id, reference: r.reference!, town: r.town!, addressLine: r.address_line! } : null,
  };
}

const severityOrder = sql`case a.severity when 'critical' then 0 when 'warning' then 1 else 2 end`;

async function selectAlerts(where: SQL, order: SQL, limit: number, offset: number): Promise<AlertRowSql[]> {
  const res = await db().execute<AlertRowSql>(sql`
    select a.id, a.kind, a.severity, a.state, a.evidence, a.opened_at, a.acknowledged_at, ack.name as ack_name, a.resolved_at, a.resolved_by,
      res.name as res_name, a.note, a.assignee_id, asg.name as assignee_name, asg.email as assignee_email,
      t.id as tank_id, t.serial, h.id as home_id, h.reference, h.town, h.address_line, count(*) over () as total
    from alerts a join tanks t on t.id = a.tank_id left join homes h on h.id = t.home_id
    left join "user" ack on ack.id = a.acknowledged_by left join "user" res on res.id = a.resolved_by left join "user" asg on asg.id = a.assignee_id
    where ${where} order by ${order} limit ${limit} offset ${offset}`);
  return res.rows;
}

export async function listAlerts(
  scope: Scope,
  f: AlertFilters,
): Promise<{ items: AlertListItem[]; total: number; page: number; pageSize: number }> {
  const where: SQL[] = [alertInScope(scope)];
  if (f.kind) where.push(sql`a.kind = ${f.kind}`);
  if (f.severity) where.push(sql`a.severity = ${f.severity}`);
  if (f.state === 'active' || f.state === undefined) where.push(sql`a.state <> 'resolved'`);
  else where.push(sql`a.state = ${f.state}`);
  if (f.assignee === 'none') where.push(sql`a.assignee_id is null`);
  else if (f.assignee) where.push(sql`a.assignee_id = ${f.assignee}`);
  if (f.town) where.push(sql`h.town = ${f.town}`);
  if (f.tankId && isUuid(f.tankId)) where.push(sql`a.tank_id = ${f.tankId}`);
  const page = Math.max(1, f.page ?? 1);
  const rows = await selectAlerts(
    sql.join(where, sql` and `),
    sql`${severityOrder}, a.opened_at desc, a.id`,
    alertsPageSize,
    (page - 1) * alertsPageSize,
  );
  return { items: rows.map(toItem), total: rows[0] ? Number(rows[0].total) : 0, page, pageSize: alertsPageSize };
}

export async function getAlert(scope: Scope, id: string): Promise<AlertListItem | null> {
  if (!isUuid(id)) return null;
  const [r] = await selectAlerts(sql`${alertInScope(scope)} and a.id = ${id}`, sql`a.id`, 1, 0);
  return r ? toItem(r) : null;
}

/** Acknowledges the open alerts among `ids` (others are left as they are); returns the ids changed. */
export async function acknowledgeAlerts(
  scope: Scope,
  ids: readonly string[],
  userId: string,
  note: string | null,
): Promise<string[]> {
  const valid = ids.filter(isUuid);
  if (valid.length === 0) return [];
  const res = await db().execute<{ id: string }>(sql`
    update alerts a set state = 'acknowledged', acknowledged_at = now(), acknowledged_by = ${userId}, note = coalesce(${note}, a.note), updated_at = now()
    from tanks t where t.id = a.tank_id and ${alertInScope(scope)} and a.state = 'open' and a.id = any(string_to_array(${valid.join(',')}, ',')::uuid[])
    returning a.id`);
  return res.rows.map((r) => r.id);
}

/** Resolves one alert by hand; false when it is not in scope or already resolved. */
export async function resolveAlert(scope: Scope, id: string, userId: string, note: string | null): Promise<boolean> {
  if (!isUuid(id)) return false;
  const res = await db().execute<{ id: string }>(sql`
    update alerts a set state = 'resolved', resolved_at = now(), resolved_by = ${userId}, note = coalesce(${note}, a.note), updated_at = now()
    from tanks t where t.id = a.tank_id and ${alertInScope(scope)} and a.state <> 'resolved' and a.id = ${id} returning a.id`);
  return res.rows.length > 0;
}

/** Assigns an alert to a staff member of its company (null: nobody); false when either is not found. */
export async function assignAlert(scope: Scope, id: string, assigneeId: string | null): Promise<boolean> {
  if (!isUuid(id)) return false;
  if (assigneeId !== null) {
    const m = await db().execute(
      sql`select 1 from memberships where user_id = ${assigneeId} and company_id = ${scope.companyId} and role <> 'householder'`,
    );
    if (m.rows.length === 0) return false;
  }
  const res = await db().execute<{ id: string }>(sql`
    update alerts a set assignee_id = ${assigneeId}, updated_at = now() from tanks t
    where t.id = a.tank_id and ${alertInScope(scope)} and a.id = ${id} returning a.id`);
  return res.rows.length > 0;
}

/** Staff who may be assigned alerts. */
export async function listAssignableStaff(
  companyId: string,
): Promise<{ id: string; name: string | null; email: string; role: string }[]> {
  const res = await db().execute<{ id: string; name: string | null; email: string; role: string }>(sql`
    select u.id, u.name, u.email, m.role from memberships m join "user" u on u.id = m.user_id
    where m.company_id = ${companyId} and m.role <> 'householder' order by u.name nulls last, u.email`);
  return res.rows;
}

// ---------------------------------------------------------------- notifications

export interface Recipient {
  userId: string;
  email: string;
  name: string | null;
}

export async function staffWithRole(companyId: string, role: 'operator' | 'admin'): Promise<Recipient[]> {
  const res = await db().execute<{ id: string; email: string; name: string | null }>(sql`
    select u.id, u.email, u.name from memberships m join "user" u on u.id = m.user_id where m.company_id = ${companyId} and m.role = ${role}`);
  return res.rows.map((r) => ({ userId: r.id, email: r.email, name: r.name }));
}

/** The householders of a tank's home who have not opted out of notices. */
export async function householdersToNotify(tankId: string): Promise<Recipient[]> {
  const res = await db().execute<{ id: string; email: string; name: string | null }>(sql`
    select u.id, u.email, u.name from tanks t join home_members hm on hm.home_id = t.home_id join "user" u on u.id = hm.user_id
    join memberships m on m.user_id = u.id and m.company_id = t.company_id and m.role = 'householder'
    left join notification_preferences p on p.user_id = u.id
    where t.id = ${tankId} and coalesce(p.householder_notices, true)`);
  return res.rows.map((r) => ({ userId: r.id, email: r.email, name: r.name }));
}

export interface NotifiableAlert {
  id: string;
  companyId: string;
  companyName: string;
  tankId: string;
  serial: string;
  homeId: string | null;
  homeLabel: string | null;
  kind: AlertKind;
  severity: AlertSeverity;
  state: AlertState;
  openedAt: Date;
  resolvedAt: Date | null;
  evidence: AlertEvidence;
}

type NotifiableRow = {
  id: string;
  company_id: string;
  company_name: string;
  tank_id: string;
  serial: string;
  home_id: string | null;
  address_line: string | null;
  town: string | null;
  kind: AlertKind;
  severity: AlertSeverity;
  state: AlertState;
  opened_at: Date;
  resolved_at: Date | null;
  evidence: AlertEvidence;
};
const notifiable = (r: NotifiableRow): NotifiableAlert => ({
  id: r.id,
  companyId: r.company_id,
  companyName: r.company_name,
  tankId: r.tank_id,
  serial: r.serial,
  homeId: r.home_id,
  homeLabel: r.address_line ? `${r.address_line}, ${r.town}` : null,
  kind: r.kind,
  severity: r.severity,
  state: r.state,
  openedAt: new Date(r.opened_at),
  resolvedAt: r.resolved_at ? new Date(r.resolved_at) : null,
  evidence: r.evidence,
});
const notifiableSelect = sql`
  select a.id, a.company_id, c.name as company_name, a.tank_id, t.serial, h.id as home_id, h.address_line, h.town, a.kind, a.severity, a.state, a.opened_at, a.resolved_at, a.evidence
  from alerts a join companies c on c.id = a.company_id join tanks t on t.id = a.tank_id left join homes h on h.id = t.home_id`;

/**
 * Unresolved alerts opened since `since` that have not been through `channel` yet: severe ones
 * for the operators' immediate notice, or the householder kinds for the home's notice.
 */
export async function alertsAwaiting(
  channel: 'immediate' | 'householder',
  since: Date,
  opts: { kinds?: readonly AlertKind[]; companyId?: string } = {},
): Promise<NotifiableAlert[]> {
  const res = await db().execute<NotifiableRow>(sql`${notifiableSelect}
    where a.state <> 'resolved' and a.opened_at >= ${since.toISOString()}::timestamptz
      ${channel === 'immediate' ? sql`and a.severity = 'critical'` : sql``}
      ${opts.kinds ? sql`and a.kind = any(string_to_array(${opts.kinds.join(',')}, ',')::alert_kind[])` : sql``}
      ${opts.companyId ? sql`and a.company_id = ${opts.companyId}` : sql``}
      and not exists (select 1 from alert_notifications n where n.alert_id = a.id and n.channel = ${channel})
    order by a.company_id, a.opened_at`);
  return res.rows.map(notifiable);
}

/** What a company's daily digest covers: alerts opened in [from, to), and how many are still unresolved. */
export async function digestContent(
  companyId: string,
  from: Date,
  to: Date,
): Promise<{ opened: NotifiableAlert[]; stillOpen: number }> {
  const res = await db().execute<NotifiableRow>(sql`${notifiableSelect}
    where a.company_id = ${companyId} and a.opened_at >= ${from.toISOString()}::timestamptz and a.opened_at < ${to.toISOString()}::timestamptz
    order by case a.severity when 'critical' then 0 when 'warning' then 1 else 2 end, a.opened_at`);
  const open = await db().execute<{ n: number }>(
    sql`select count(*)::int as n from alerts where company_id = ${companyId} and state <> 'resolved'`,
  );
  return { opened: res.rows.map(notifiable), stillOpen: open.rows[0]?.n ?? 0 };
}

export async function companiesWithAlerts(): Promise<{ id: string; name: string }[]> {
  const res = await db().execute<{ id: string; name: string }>(
    sql`select c.id, c.name from companies c where exists (select 1 from alerts a where a.company_id = c.id) order by c.name`,
  );
  return res.rows;
}

/** Claims a notice before sending it; false when it was already sent (or claimed by another process). */
export async function claimNotification(n: {
  companyId: string;
  alertId: string | null;
  userId: string | null;
  email: string;
  channel: NotificationChannel;
  dedupeKey: string;
  subject: string;
}): Promise<boolean> {
  const res = await db().execute<{ id: number }>(sql`
    insert into alert_notifications (company_id, alert_id, user_id, email, channel, dedupe_key, subject)
    values (${n.companyId}, ${n.alertId}, ${n.userId}, ${n.email}, ${n.channel}, ${n.dedupeKey}, ${n.subject})
    on conflict (dedupe_key) do nothing returning id`);
  return res.rows.length > 0;
}

/** Gives a claimed notice back when sending failed, so the next run tries again. */
export async function releaseNotification(dedupeKey: string): Promise<void> {
  await db().execute(sql`delete from alert_notifications where dedupe_key = ${dedupeKey}`);
}

export async function notificationsOf(
  alertId: string,
): Promise<{ email: string; channel: NotificationChannel; sentAt: string }[]> {
  const res = await db().execute<{ email: string; channel: NotificationChannel; sent_at: Date }>(
    sql`select email, channel, sent_at from alert_notifications where alert_id = ${alertId} order by sent_at`,
  );
  return res.rows.map((r) => ({ email: r.email, channel: r.channel, sentAt: new Date(r.sent_at).toISOString() }));
}

export async function getNoticePreference(userId: string): Promise<boolean> {
  const res = await db().execute<{ on: boolean }>(
    sql`select householder_notices as on from notification_preferences where user_id = ${userId}`,
  );
  return res.rows[0]?.on ?? true;
}

export async function setNoticePreference(userId: string, on: boolean): Promise<void> {
  await db().execute(sql`
    insert into notification_preferences (user_id, householder_notices, updated_at) values (${userId}, ${on}, now())
    on conflict (user_id) do update set householder_notices = excluded.householder_notices, updated_at = now()`);
}
