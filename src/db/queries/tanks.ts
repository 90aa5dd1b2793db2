import { sql, type SQL } from 'drizzle-orm';
import { db } from '..';
import type { Scope } from '../../lib/server/authz';
import type { TankListItem, TankListResponse, TanksQuery } from '../../lib/views/contracts';
import { statusOf, type AttentionKind } from '../../lib/views/attention';
import { ccToC, layersFromCc } from '../../lib/views/layers';
import type { HeatSource } from '../schema/homes';
import { attentionFacts, attentionSnapshot, scopeWhere, type AttentionSnapshot } from './fleet';
import { isUuid } from './scope';

type ListRow = {
  id: string; serial: string; model: string; volume_l: number; heat_source: HeatSource;
  home_id: string | null; reference: string | null; town: string | null; address_line: string | null;
  last_seen_at: Date | null; soc: number | null; v40_l: number | null; top_cc: number | null; kinds: string | null; total: string;
}

const sortColumns: Record<TanksQuery['sort'], { expr: SQL; dir: 'asc' | 'desc' }> = {
  attention: { expr: sql`coalesce(a.rank, 99)`, dir: 'asc' },
  serial: { expr: sql`t.serial`, dir: 'asc' },
  town: { expr: sql`h.town`, dir: 'asc' },
  soc: { expr: sql`l.soc`, dir: 'asc' },
  v40: { expr: sql`l.v40_l`, dir: 'asc' },
  lastSeen: { expr: sql`l.last_seen_at`, dir: 'desc' },
  volume: { expr: sql`t.volume_l`, dir: 'asc' },
};

/** The flagged tanks of a snapshot as three parallel text lists, joined in SQL with unnest. */
function attentionArrays(snap: AttentionSnapshot): { ids: string; ranks: string; kinds: string } {
  const ids: string[] = [];
  const ranks: number[] = [];
  const kinds: string[] = [];
  for (const e of snap.byTank.values()) { ids.push(e.tankId); ranks.push(e.rank); kinds.push(e.kinds.join(' ')); }
  return { ids: ids.join(','), ranks: ranks.join(','), kinds: kinds.join(',') };
}

/**
 * The scope's tanks with their latest state and what needs attention, filtered, sorted and paged
 * in SQL. Reads the latest-state table, never readings.
 */
export async function listTanks(scope: Scope, q: TanksQuery): Promise<TankListResponse> {
  const snap = await attentionSnapshot(scope);
  const a = attentionArrays(snap);
  const where: SQL[] = [scopeWhere(scope)];
  if (q.q) {
    const like = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    where.push(sql`(t.serial ilike ${like} or t.model ilike ${like} or h.reference ilike ${like} or h.address_line ilike ${like} or h.postcode ilike ${like} or h.town ilike ${like} or h.contact_name ilike ${like})`);
  }
  if (q.town) where.push(sql`h.town = ${q.town}`);
  if (q.heatSource) where.push(sql`t.heat_source = ${q.heatSource}`);
  if (q.status === 'offline') where.push(sql`a.rank = 0`);
  if (q.status === 'attention') where.push(sql`a.rank > 0`);
  if (q.status === 'ok') where.push(sql`a.tank_id is null`);
  if (q.alert) where.push(sql`${q.alert} = any(string_to_array(a.kinds, ' '))`);
  const sort = sortColumns[q.sort];
  const dir = q.dir ?? sort.dir;
  const order = sql.join([sql`${sort.expr} ${sql.raw(dir)} nulls last`, sql`t.serial asc`], sql`, `);
  const res = await db().execute<ListRow>(sql`
    select t.id, t.serial, t.model, t.volume_l, t.heat_source, h.id as home_id, h.reference, h.town, h.address_line,
      l.last_seen_at, l.soc, l.v40_l, l.layers_cc[array_upper(l.layers_cc, 1)] as top_cc, a.kinds, 0 as total
    from tanks t
    left join homes h on h.id = t.home_id
    left join tank_latest_state l on l.tank_id = t.id
    left join unnest(
      string_to_array(${a.ids}, ',')::uuid[], string_to_array(${a.ranks}, ',')::int[], string_to_array(${a.kinds}, ',')
    ) as a(tank_id, rank, kinds) on a.tank_id = t.id
    where ${sql.join(where, sql` and `)}
    order by ${order}
    limit ${q.pageSize} offset ${(q.page - 1) * q.pageSize}`);
  // Counted apart from the page: a window count would make PostgreSQL build every row before the LIMIT.
  const total = res.rows.length < q.pageSize && (q.page === 1 || res.rows.length > 0) ? (q.page - 1) * q.pageSize + res.rows.length : await countTanks(where, a, q);
  return { items: res.rows.map(toItem), total, page: q.page, pageSize: q.pageSize };
}

/** Tanks matching the filters; joins only what the filters read. */
async function countTanks(where: SQL[], a: { ids: string; ranks: string; kinds: string }, q: TanksQuery): Promise<number> {
  const homesJoin = q.q || q.town ? sql`left join homes h on h.id = t.home_id` : sql``;
  const attentionJoin = q.status || q.alert
    ? sql`left join unnest(string_to_array(${a.ids}, ',')::uuid[], string_to_array(${a.ranks}, ',')::int[], string_to_array(${a.kinds}, ','))
      as a(tank_id, rank, kinds) on a.tank_id = t.id`
    : sql``;
  const res = await db().execute<{ n: number }>(sql`
    select count(*)::int as n from tanks t ${homesJoin} ${attentionJoin}
    where ${sql.join(where, sql` and `)}`);
  return res.rows[0]?.n ?? 0;
}

function toItem(r: ListRow): TankListItem {
  const attention = (r.kinds ? r.kinds.split(' ') : []) as AttentionKind[];
  return {
    id: r.id, serial: r.serial, model: r.model, volumeL: r.volume_l, heatSource: r.heat_source,
    home: r.home_id ? { id: r.home_id, reference: r.reference!, town: r.town!, addressLine: r.address_line! } : null,
    lastSeenAt: r.last_seen_at ? new Date(r.last_seen_at).toISOString() : null,
    soc: r.soc, v40L: r.v40_l, topC: ccToC(r.top_cc), status: statusOf(attention), attention,
  };
}

/** Tanks by id in the order given (the triage queue), from the same list query shape. */
export async function listTanksByIds(scope: Scope, ids: readonly string[], snap: AttentionSnapshot): Promise<TankListItem[]> {
  if (ids.length === 0) return [];
  const res = await db().execute<ListRow>(sql`
    select t.id, t.serial, t.model, t.volume_l, t.heat_source, h.id as home_id, h.reference, h.town, h.address_line,
      l.last_seen_at, l.soc, l.v40_l, l.layers_cc[array_upper(l.layers_cc, 1)] as top_cc, null as kinds, 0 as total
    from tanks t left join homes h on h.id = t.home_id left join tank_latest_state l on l.tank_id = t.id
    where ${scopeWhere(scope)} and t.id = any(string_to_array(${ids.join(',')}, ',')::uuid[])`);
  const byId = new Map(res.rows.map((r) => [r.id, r]));
  return ids.flatMap((id) => {
    const r = byId.get(id);
    return r ? [toItem({ ...r, kinds: snap.byTank.get(id)?.kinds.join(' ') ?? null })] : [];
  });
}

/** Towns the scope's homes are in, for the filter. */
export async function listTowns(scope: Scope): Promise<string[]> {
  const res = await db().execute<{ town: string }>(sql`select distinct h.town from tanks t join homes h on h.id = t.home_id where ${scopeWhere(scope)} order by 1`);
  return res.rows.map((r) => r.town);
}

export interface TankRecord {
  id: string; serial: string; model: string; volumeL: number; heightM: number; sensorCount: number; sensorHeightsM: number[] | null;
  heatSource: HeatSource; hpOutputW: number; immersionW: number; declaredLossW: number | null; targetC: number; hysteresisK: number;
  commissionedAt: Date | null;
  home: { id: string; reference: string; addressLine: string; town: string; postcode: string; occupants: number; hasSolar: boolean } | null;
  latest: {
    ts: Date | null; lastSeenAt: Date | null; online: boolean | null; layersC: (number | null)[]; flowC: number | null; returnC: number | null;
    compressor: boolean | null; immersionW: number | null; powerW: number | null; drawLpm: number | null; soc: number | null; v40L: number | null;
  } | null;
}

type TankRow = {
  id: string; serial: string; model: string; volume_l: number; height_m: number; sensor_count: number; sensor_heights_m: number[] | null;
  heat_source: HeatSource; hp_output_w: number; immersion_w: number; declared_loss_w: number | null; target_c: number; hysteresis_k: number;
  commissioned_at: Date | null; home_id: string | null; reference: string | null; address_line: string | null; town: string | null; postcode: string | null;
  occupants: number | null; has_solar: boolean | null;
  l_tank: string | null; ts: Date | null; last_seen_at: Date | null; online: boolean | null; layers_cc: (number | null)[] | null; flow_cc: number | null;
  return_cc: number | null; compressor: boolean | null; l_immersion_w: number | null; power_w: number | null; draw_dlpm: number | null; soc: number | null; v40_l: number | null;
}

/** One tank in scope with its home and latest state, or null (also for a malformed id). */
export async function getTank(scope: Scope, id: string): Promise<TankRecord | null> {
  if (!isUuid(id)) return null;
  const res = await db().execute<TankRow>(sql`
    select t.id, t.serial, t.model, t.volume_l, t.height_m, t.sensor_count, t.sensor_heights_m, t.heat_source, t.hp_output_w, t.immersion_w,
      t.declared_loss_w, t.target_c, t.hysteresis_k, t.commissioned_at,
      h.id as home_id, h.reference, h.address_line, h.town, h.postcode, h.occupants, h.has_solar,
      l.tank_id as l_tank, l.ts, l.last_seen_at, l.online, l.layers_cc, l.flow_cc, l.return_cc, l.compressor, l.immersion_w as l_immersion_w,
      l.power_w, l.draw_dlpm, l.soc, l.v40_l
    from tanks t left join homes h on h.id = t.home_id left join tank_latest_state l on l.tank_id = t.id
    where ${scopeWhere(scope)} and t.id = ${id}`);
  const r = res.rows[0];
  if (!r) return null;
  const date = (d: Date | null) => (d ? new Date(d) : null);
  return {
    id: r.id, serial: r.serial, model: r.model, volumeL: r.volume_l, heightM: r.height_m, sensorCount: r.sensor_count, sensorHeightsM: r.sensor_heights_m,
    heatSource: r.heat_source, hpOutputW: r.hp_output_w, immersionW: r.immersion_w, declaredLossW: r.declared_loss_w, targetC: r.target_c,
    hysteresisK: r.hysteresis_k, commissionedAt: date(r.commissioned_at),
    home: r.home_id ? { id: r.home_id, reference: r.reference!, addressLine: r.address_line!, town: r.town!, postcode: r.postcode!, occupants: r.occupants!, hasSolar: r.has_solar! } : null,
    latest: r.l_tank ? {
      ts: date(r.ts), lastSeenAt: date(r.last_seen_at), online: r.online, layersC: layersFromCc(r.layers_cc), flowC: ccToC(r.flow_cc), returnC: ccToC(r.return_cc),
      compressor: r.compressor, immersionW: r.l_immersion_w, powerW: r.power_w, drawLpm: r.draw_dlpm === null ? null : r.draw_dlpm / 10, soc: r.soc, v40L: r.v40_l,
    } : null,
  };
}

/** The attention facts of one tank, computed now (not from the fleet snapshot). */
export async function tankAttentionFacts(tankId: string) {
  const [f] = await attentionFacts(sql`t.id = ${tankId}`);
  return f ?? null;
}

/** The first tank of each home a householder may see (the home page shows one cylinder). */
export async function tanksOfScope(scope: Scope): Promise<{ id: string; serial: string; homeId: string | null }[]> {
  const res = await db().execute<{ id: string; serial: string; home_id: string | null }>(sql`select t.id, t.serial, t.home_id from tanks t where ${scopeWhere(scope)} order by t.serial limit 20`);
  return res.rows.map((r) => ({ id: r.id, serial: r.serial, homeId: r.home_id }));
}
