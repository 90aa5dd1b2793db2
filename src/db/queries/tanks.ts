import { sql, type SQL } from 'drizzle-orm';
import { db, lagTolerant, type Db } from '..';
import type { Scope } from '../../lib/server/authz';
import type { TankListItem, TankListResponse, TanksQuery } from '../../lib/views/contracts';
import { attentionKinds, byUrgency, statusOf, type AttentionKind } from '../../lib/views/attention';
import { ccToC, layersFromCc, storedQuality } from '../../lib/views/layers';
import { stuckSensors, type FiguresQuality, type StuckState } from '../../lib/thermal';
import type { HeatSource } from '../schema/homes';
import { isUuid, scopeWhere } from './scope';

// ---------------------------------------------------------------- the tank list
//
// What needs attention is the tank's unresolved alerts (src/lib/alerts decides, the `alerts` table
// keeps it), read here with indexed queries, so a page costs about one page of rows whatever the
// fleet's size. Each sort is one or two segments that PostgreSQL walks in index order and stops
// after the page: the ranked list is the tanks with open alerts (a few per cent) by urgency, then
// the rest by serial; a sort on a latest-state figure is the tanks that have it (index on the
// figure), then those that do not. Every order ends on the serial, and one page reads its segments
// in one snapshot, so pages never overlap.

/** Something that runs SQL: the client, or a transaction on it. */
type Exec = Pick<Db, 'execute'>;

/** The alert kinds in the desk's order, as a literal array: `array_position` gives the urgency. */
const kindOrder = sql.raw(`array[${attentionKinds.map((k) => `'${k}'`).join(', ')}]::alert_kind[]`);

/** The tank `t` has an unresolved alert (of `kind`); the partial unique index on alerts answers it. */
const hasOpenAlert = (kind?: AttentionKind): SQL =>
  sql`exists (select 1 from alerts x where x.tank_id = t.id and x.state <> 'resolved'${kind ? sql` and x.kind = ${kind}` : sql``})`;

/** Each tank of the company with unresolved alerts and its most urgent one (0 = offline). */
const flaggedTanks = (scope: Scope): SQL => sql`(
  select x.tank_id, min(array_position(${kindOrder}, x.kind)) - 1 as rank
  from alerts x where x.company_id = ${scope.companyId} and x.state <> 'resolved' group by x.tank_id)`;

/** A free-text search matching at most this many tanks is handed to the list as their ids. */
const SEARCH_ID_LIMIT = 2000;

/**
 * The filters as conditions on tanks `t` alone, so every segment and the count can use them. The
 * free text is looked up once through the trigram indexes: a few matches become a list of ids
 * (each later query then reads only those tanks); many stay two hashed subqueries.
 */
async function filtersOf(tx: Exec, scope: Scope, q: TanksQuery): Promise<SQL[]> {
  const where: SQL[] = [scopeWhere(scope)];
  if (q.q) {
    // search_text is lower-cased on write; lower() here folds the pattern the same way.
    const like = sql`lower(${`%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`})`;
    const byTank = sql`select ts.id from tanks ts where ts.company_id = ${scope.companyId} and ts.search_text like ${like}`;
    const byHome = sql`select hs.id from homes hs where hs.company_id = ${scope.companyId} and hs.search_text like ${like}`;
    // union all streams, so a search matching most of the fleet stops at the limit.
    const found = await tx.execute<{ id: string }>(sql`
      ${byTank} union all select tt.id from tanks tt where tt.home_id in (${byHome}) limit ${SEARCH_ID_LIMIT + 1}`);
    const ids = [...new Set(found.rows.map((r) => r.id))];
    if (found.rows.length <= SEARCH_ID_LIMIT)
      where.push(sql`t.id = any(string_to_array(${ids.join(',')}, ',')::uuid[])`);
    else where.push(sql`(t.id in (${byTank}) or t.home_id in (${byHome}))`);
  }
  if (q.town)
    where.push(
      sql`t.home_id in (select ht.id from homes ht where ht.company_id = ${scope.companyId} and ht.town = ${q.town})`,
    );
  if (q.heatSource) where.push(sql`t.heat_source = ${q.heatSource}`);
  if (q.status === 'offline') where.push(hasOpenAlert('offline'));
  if (q.status === 'attention') where.push(sql`${hasOpenAlert()} and not ${hasOpenAlert('offline')}`);
  if (q.status === 'ok') where.push(sql`not ${hasOpenAlert()}`);
  if (q.alert) where.push(hasOpenAlert(q.alert));
  return where;
}

/** Rows of one stretch of the order: `key` orders them (then the serial), null when only the serial does. */
interface Segment {
  from: SQL;
  where?: SQL;
  key: SQL | null;
}

function segmentsOf(scope: Scope, q: TanksQuery, dir: 'asc' | 'desc'): Segment[] {
  const latest = (col: string): Segment[] => [
    {
      from: sql`tanks t join tank_latest_state l on l.tank_id = t.id`,
      where: sql.raw(`l.${col} is not null`),
      key: sql.raw(`l.${col}`),
    },
    {
      from: sql`tanks t`,
      where: sql.raw(`not exists (select 1 from tank_latest_state l where l.tank_id = t.id and l.${col} is not null)`),
      key: null,
    },
  ];
  switch (q.sort) {
    case 'attention': {
      const flagged: Segment = {
        from: sql`tanks t join ${flaggedTanks(scope)} a on a.tank_id = t.id`,
        key: sql`a.rank`,
      };
      const rest: Segment = { from: sql`tanks t`, where: sql`not ${hasOpenAlert()}`, key: null };
      // A filter on problems leaves one of the two (walking the other would find nothing, slowly).
      if (q.alert || q.status === 'offline' || q.status === 'attention') return [flagged];
      if (q.status === 'ok') return [rest];
      // Ascending is the most urgent first; descending puts the tanks with nothing wrong first.
      return dir === 'asc' ? [flagged, rest] : [rest, flagged];
    }
    case 'serial':
      return [{ from: sql`tanks t`, key: sql`t.serial` }];
    case 'volume':
      return [{ from: sql`tanks t`, key: sql`t.volume_l` }];
    case 'town':
      return [
        { from: sql`tanks t join homes h on h.id = t.home_id`, key: sql`h.town` },
        { from: sql`tanks t`, where: sql`t.home_id is null`, key: null },
      ];
    case 'soc':
      return latest('soc');
    case 'v40':
      return latest('v40_l');
    case 'lastSeen':
      return latest('last_seen_at');
  }
}

type ListRow = {
  id: string;
  serial: string;
  model: string;
  volume_l: number;
  heat_source: HeatSource;
  home_id: string | null;
  reference: string | null;
  town: string | null;
  address_line: string | null;
  last_seen_at: Date | null;
  soc: number | null;
  v40_l: number | null;
  figures_quality: FiguresQuality | null;
  top_cc: number | null;
  kinds: string | null;
};

/** The columns of a list row for the tanks `t` of a page (homes `h`, latest state `l` joined). */
const listColumns = sql`t.id, t.serial, t.model, t.volume_l, t.heat_source, h.id as home_id, h.reference, h.town, h.address_line,
  l.last_seen_at, l.soc, l.v40_l, l.figures_quality, l.layers_cc[array_upper(l.layers_cc, 1)] as top_cc,
  (select string_agg(x.kind::text, ' ' order by array_position(${kindOrder}, x.kind)) from alerts x where x.tank_id = t.id and x.state <> 'resolved') as kinds`;
const listJoins = sql`left join homes h on h.id = t.home_id left join tank_latest_state l on l.tank_id = t.id`;

/**
 * The scope's tanks with their latest state and what needs attention, filtered, sorted and paged
 * in SQL. Reads the latest-state and alerts tables, never readings.
 */
export async function listTanks(scope: Scope, q: TanksQuery): Promise<TankListResponse> {
  const dir = q.dir ?? (q.sort === 'lastSeen' ? 'desc' : 'asc');
  const offset = (q.page - 1) * q.pageSize;
  return lagTolerant((d) =>
    d.transaction(
      async (tx) => {
        const where = await filtersOf(tx, scope, q);
        // The page is cut from the segments one after the other: a later one is read only when the
        // earlier ones end inside the page (a segment read to its end would cost a walk of the fleet).
        const ids: string[] = [];
        let skip = offset;
        for (const segment of segmentsOf(scope, q, dir)) {
          const got = await segmentIds(tx, segment, where, dir, skip, q.pageSize - ids.length);
          ids.push(...got);
          if (ids.length === q.pageSize) break;
          skip = got.length > 0 ? 0 : Math.max(0, skip - (await countTanks(tx, segment, where)));
        }
        const items = await listTanksByIds(tx, ids);
        // Counted apart from the page, and only when the page does not tell.
        const full = items.length === q.pageSize || (items.length === 0 && q.page > 1);
        const total = full ? await countTanks(tx, { from: sql`tanks t` }, where) : offset + items.length;
        return { items, total, page: q.page, pageSize: q.pageSize };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    ),
  );
}

/** One segment's tank ids in its order, from `skip`, at most `limit`. */
async function segmentIds(
  tx: Exec,
  s: Segment,
  where: SQL[],
  dir: 'asc' | 'desc',
  skip: number,
  limit: number,
): Promise<string[]> {
  const order = s.key ? sql`${s.key} ${sql.raw(dir)}, t.serial asc` : sql`t.serial asc`;
  const res = await tx.execute<{ id: string }>(sql`
    select t.id from ${s.from} where ${sql.join(s.where ? [...where, s.where] : where, sql` and `)}
    order by ${order} limit ${limit} offset ${skip}`);
  return res.rows.map((r) => r.id);
}

async function countTanks(tx: Exec, s: Pick<Segment, 'from' | 'where'>, where: SQL[]): Promise<number> {
  const res = await tx.execute<{ n: number }>(sql`
    select count(*)::int as n from ${s.from} where ${sql.join(s.where ? [...where, s.where] : where, sql` and `)}`);
  return res.rows[0]?.n ?? 0;
}

/** List rows of the tanks `ids`, in that order. */
async function listTanksByIds(tx: Exec, ids: readonly string[]): Promise<TankListItem[]> {
  if (ids.length === 0) return [];
  const res = await tx.execute<ListRow>(sql`
    select ${listColumns} from unnest(string_to_array(${ids.join(',')}, ',')::uuid[]) with ordinality as p(id, n)
    join tanks t on t.id = p.id ${listJoins} order by p.n`);
  return res.rows.map(toItem);
}

function toItem(r: ListRow): TankListItem {
  const attention = byUrgency((r.kinds ? r.kinds.split(' ') : []) as AttentionKind[]);
  return {
    id: r.id,
    serial: r.serial,
    model: r.model,
    volumeL: r.volume_l,
    heatSource: r.heat_source,
    home: r.home_id ? { id: r.home_id, reference: r.reference!, town: r.town!, addressLine: r.address_line! } : null,
    lastSeenAt: r.last_seen_at ? new Date(r.last_seen_at).toISOString() : null,
    soc: r.soc,
    v40L: r.v40_l,
    quality: storedQuality(r.figures_quality, r.last_seen_at !== null),
    topC: ccToC(r.top_cc),
    status: statusOf(attention),
    attention,
  };
}

/**
 * The tanks to deal with first: unresolved alerts, the most urgent kind first, then the tank with
 * more problems, then the one whose oldest alert has waited longest.
 */
export async function attentionQueue(scope: Scope, limit: number): Promise<TankListItem[]> {
  const res = await db().execute<ListRow>(sql`
    with q as (
      select x.tank_id, min(array_position(${kindOrder}, x.kind)) as rank, count(*) as n, min(x.opened_at) as since
      from alerts x join tanks t on t.id = x.tank_id
      where x.company_id = ${scope.companyId} and x.state <> 'resolved' and ${scopeWhere(scope)}
      group by x.tank_id order by rank, n desc, since, x.tank_id limit ${limit})
    select ${listColumns} from q join tanks t on t.id = q.tank_id ${listJoins}
    order by q.rank, q.n desc, q.since, q.tank_id`);
  return res.rows.map(toItem);
}

/** Towns the scope's homes are in, for the filter. */
export async function listTowns(scope: Scope): Promise<string[]> {
  const res = await db().execute<{ town: string }>(
    sql`select distinct h.town from tanks t join homes h on h.id = t.home_id where ${scopeWhere(scope)} order by 1`,
  );
  return res.rows.map((r) => r.town);
}

export interface TankRecord {
  id: string;
  serial: string;
  model: string;
  volumeL: number;
  heightM: number;
  sensorCount: number;
  sensorHeightsM: number[] | null;
  heatSource: HeatSource;
  hpOutputW: number;
  immersionW: number;
  declaredLossW: number | null;
  targetC: number;
  hysteresisK: number;
  commissionedAt: Date | null;
  /** The home's cold inlet, °C, where the company has set one. */ coldInletC: number | null;
  home: {
    id: string;
    reference: string;
    addressLine: string;
    town: string;
    postcode: string;
    occupants: number;
    hasSolar: boolean;
  } | null;
  latest: {
    ts: Date | null;
    lastSeenAt: Date | null;
    online: boolean | null;
    layersC: (number | null)[];
    flowC: number | null;
    returnC: number | null;
    compressor: boolean | null;
    immersionW: number | null;
    powerW: number | null;
    drawLpm: number | null;
    soc: number | null;
    v40L: number | null;
    /** Sensors (0-based) the writer's stuck check holds stuck: the figures leave them out. */ stuck: number[];
  } | null;
}

type TankRow = {
  id: string;
  serial: string;
  model: string;
  volume_l: number;
  height_m: number;
  sensor_count: number;
  sensor_heights_m: number[] | null;
  heat_source: HeatSource;
  hp_output_w: number;
  immersion_w: number;
  declared_loss_w: number | null;
  target_c: number;
  hysteresis_k: number;
  commissioned_at: Date | null;
  home_id: string | null;
  reference: string | null;
  address_line: string | null;
  town: string | null;
  postcode: string | null;
  occupants: number | null;
  has_solar: boolean | null;
  cold_inlet_c: number | null;
  l_tank: string | null;
  ts: Date | null;
  last_seen_at: Date | null;
  online: boolean | null;
  layers_cc: (number | null)[] | null;
  flow_cc: number | null;
  return_cc: number | null;
  compressor: boolean | null;
  l_immersion_w: number | null;
  power_w: number | null;
  draw_dlpm: number | null;
  soc: number | null;
  v40_l: number | null;
  sensor_check: StuckState | null;
};

/** One tank in scope with its home and latest state, or null (also for a malformed id). */
export async function getTank(scope: Scope, id: string): Promise<TankRecord | null> {
  if (!isUuid(id)) return null;
  const res = await db().execute<TankRow>(sql`
    select t.id, t.serial, t.model, t.volume_l, t.height_m, t.sensor_count, t.sensor_heights_m, t.heat_source, t.hp_output_w, t.immersion_w,
      t.declared_loss_w, t.target_c, t.hysteresis_k, t.commissioned_at,
      h.id as home_id, h.reference, h.address_line, h.town, h.postcode, h.occupants, h.has_solar, h.cold_inlet_c,
      l.tank_id as l_tank, l.ts, l.last_seen_at, l.online, l.layers_cc, l.flow_cc, l.return_cc, l.compressor, l.immersion_w as l_immersion_w,
      l.power_w, l.draw_dlpm, l.soc, l.v40_l, l.sensor_check
    from tanks t left join homes h on h.id = t.home_id left join tank_latest_state l on l.tank_id = t.id
    where ${scopeWhere(scope)} and t.id = ${id}`);
  const r = res.rows[0];
  if (!r) return null;
  const date = (d: Date | null) => (d ? new Date(d) : null);
  return {
    id: r.id,
    serial: r.serial,
    model: r.model,
    volumeL: r.volume_l,
    heightM: r.height_m,
    sensorCount: r.sensor_count,
    sensorHeightsM: r.sensor_heights_m,
    heatSource: r.heat_source,
    hpOutputW: r.hp_output_w,
    immersionW: r.immersion_w,
    declaredLossW: r.declared_loss_w,
    targetC: r.target_c,
    hysteresisK: r.hysteresis_k,
    commissionedAt: date(r.commissioned_at),
    coldInletC: r.cold_inlet_c,
    home: r.home_id
      ? {
          id: r.home_id,
          reference: r.reference!,
          addressLine: r.address_line!,
          town: r.town!,
          postcode: r.postcode!,
          occupants: r.occupants!,
          hasSolar: r.has_solar!,
        }
      : null,
    latest: r.l_tank
      ? {
          ts: date(r.ts),
          lastSeenAt: date(r.last_seen_at),
          online: r.online,
          layersC: layersFromCc(r.layers_cc),
          flowC: ccToC(r.flow_cc),
          returnC: ccToC(r.return_cc),
          compressor: r.compressor,
          immersionW: r.l_immersion_w,
          powerW: r.power_w,
          drawLpm: r.draw_dlpm === null ? null : r.draw_dlpm / 10,
          soc: r.soc,
          v40L: r.v40_l,
          stuck: stuckSensors(r.sensor_check),
        }
      : null,
  };
}

/** The first tank of each home a householder may see (the home page shows one cylinder). */
export async function tanksOfScope(scope: Scope): Promise<{ id: string; serial: string; homeId: string | null }[]> {
  const res = await db().execute<{ id: string; serial: string; home_id: string | null }>(
    sql`select t.id, t.serial, t.home_id from tanks t where ${scopeWhere(scope)} order by t.serial limit 20`,
  );
  return res.rows.map((r) => ({ id: r.id, serial: r.serial, homeId: r.home_id }));
}
