// Query strings the views API accepts (zod, validated at the edge) and the JSON it answers.
// Server-only: islands import the types with `import type`, so zod stays out of their bundles.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { attentionKinds, tankStatuses, type AttentionKind, type TankStatus } from './attention';
import { heatSourceValues } from './labels';
import type { TankRecord } from '../../db/queries/tanks';
import type { HeatSource } from '../../db/schema/homes';
import type { ColumnFigures, FiguresQuality } from './layers';
import type { FiguresStatus } from '../thermal';
import type { AlertSeverity } from '../alerts/types';

const tankSortKeys = ['attention', 'serial', 'town', 'soc', 'v40', 'lastSeen', 'volume'] as const;
export type TankSortKey = (typeof tankSortKeys)[number];

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .optional()
    .transform((v) => (v ? v : undefined));

export const tanksQuerySchema = z
  .object({
    q: optionalText(100),
    status: z.enum(tankStatuses).optional(),
    alert: z.enum(attentionKinds).optional(),
    town: optionalText(100),
    heatSource: z.enum(heatSourceValues).optional(),
    sort: z.enum(tankSortKeys).default('attention'),
    dir: z.enum(['asc', 'desc']).optional(),
    page: z.coerce
      .number({ error: 'page must be a whole number from 1.' })
      .int('page must be a whole number from 1.')
      .min(1, 'page must be a whole number from 1.')
      .default(1),
    pageSize: z.coerce
      .number()
      .int('pageSize must be a whole number.')
      .min(1, 'pageSize must be between 1 and 200.')
      .max(200, 'pageSize must be between 1 and 200.')
      .default(25),
  })
  .strict();
export type TanksQuery = z.infer<typeof tanksQuerySchema>;

export const resolutions = ['raw', '15m', '1h'] as const;
export type Resolution = (typeof resolutions)[number];
/** Longest span each resolution serves, so one answer stays small (raw: about 11,500 readings at one a minute). */
const maxSpanMs: Record<Resolution, number> = { raw: 8 * 86_400_000, '15m': 62 * 86_400_000, '1h': 400 * 86_400_000 };

/** The step that keeps a range to a few hundred to a couple of thousand points. */
function autoResolution(spanMs: number): Resolution {
  if (spanMs <= 36 * 3_600_000) return 'raw';
  if (spanMs <= 10 * 86_400_000) return '15m';
  return '1h';
}

const isoTime = (field: string) =>
  z.string().datetime({
    offset: true,
    message: `${field} must be an ISO 8601 date-time with a time zone, e.g. 2026-03-01T07:00:00Z.`,
  });

/** from/to (default: the 24 hours to now), or null with an issue at `to` when to is not after from. */
function orderedRange(v: { from?: string; to?: string }, ctx: z.RefinementCtx): { from: Date; to: Date } | null {
  const to = v.to ? new Date(v.to) : new Date();
  const from = v.from ? new Date(v.from) : new Date(to.getTime() - 86_400_000);
  if (from < to) return { from, to };
  ctx.addIssue({ code: 'custom', path: ['to'], message: 'to must be after from.' });
  return null;
}

/**
 * from/to (ISO 8601, default the last 24 h), resolution (raw, 15m, 1h or auto) and since, a poll's
 * cursor inside the range: only points from it on are sent, their figures worked out over the whole range.
 */
export const rangeQuerySchema = z
  .object({
    from: isoTime('from').optional(),
    to: isoTime('to').optional(),
    resolution: z.enum(['auto', ...resolutions]).default('auto'),
    since: isoTime('since').optional(),
  })
  .strict()
  .transform((v, ctx) => {
    const range = orderedRange(v, ctx);
    if (!range) return z.NEVER;
    const { from, to } = range;
    const span = to.getTime() - from.getTime();
    const resolution: Resolution = v.resolution === 'auto' ? autoResolution(span) : v.resolution;
    if (span > maxSpanMs[resolution]) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['resolution'],
        message: `resolution ${resolution} serves at most ${maxSpanMs[resolution] / 86_400_000} days; choose a coarser step or a shorter range.`,
      });
      return z.NEVER;
    }
    const since = v.since ? new Date(v.since) : from;
    if (since < from || since >= to) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['since'],
        message: 'since must be inside the range: at or after from, before to.',
      });
      return z.NEVER;
    }
    return { from, to, resolution, since };
  });
export type RangeQuery = z.output<typeof rangeQuerySchema>;

/** Events in a range (default the last 24 h). */
export const eventsQuerySchema = z
  .object({ from: isoTime('from').optional(), to: isoTime('to').optional() })
  .strict()
  .transform((v, ctx) => {
    const range = orderedRange(v, ctx);
    if (!range) return z.NEVER;
    const { from, to } = range;
    if (to.getTime() - from.getTime() > 62 * 86_400_000) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['from'],
        message: 'Events are served for at most 62 days at a time.',
      });
      return z.NEVER;
    }
    return { from, to };
  });

/** Longest range a link may open (the custom range's limit, and what the events endpoint serves). */
export const maxLinkSpanMs = 62 * 86_400_000;

/** `?from=&to=` on a tank page (alert links carry them): both ISO 8601 with a zone, from before to. */
const linkRangeSchema = z
  .object({
    from: z.string(messages('from is missing (the link gives to without it).')).pipe(isoTime('from')),
    to: z.string(messages('to is missing (the link gives from without it).')).pipe(isoTime('to')),
  })
  .transform((v, ctx) => {
    const from = Date.parse(v.from);
    const to = Date.parse(v.to);
    if (from >= to) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['to'], message: 'to must be after from.' });
    else if (to - from > maxLinkSpanMs)
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['to'],
        message: `The range may span at most ${maxLinkSpanMs / 86_400_000} days.`,
      });
    return { from, to };
  });

/**
 * The range a tank page opens on: the link's, or none (the default) when it gives neither; a link
 * whose range cannot be used also gives none, with a sentence saying why (naming the field).
 */
export function rangeFromLink(params: URLSearchParams): {
  range: { from: number; to: number } | null;
  problem: string | null;
} {
  // A '+01:00' offset typed into a link unencoded arrives as ' 01:00'.
  const param = (k: string) => params.get(k)?.replace(/ (\d{2}:?\d{2})$/, '+$1') ?? null;
  const from = param('from');
  const to = param('to');
  if (from === null && to === null) return { range: null, problem: null };
  const parsed = linkRangeSchema.safeParse({ from: from ?? undefined, to: to ?? undefined });
  if (parsed.success) return { range: parsed.data, problem: null };
  const issue = parsed.error.issues[0]!;
  return { range: null, problem: `The link's time range cannot be shown: ${issue.message}` };
}

/** A query string as a plain object (repeated keys: the last wins). */
export const searchParams = (url: URL): Record<string, string> => Object.fromEntries(url.searchParams.entries());

// ---- answers ---------------------------------------------------------------------------------

export interface TankListItem {
  id: string;
  serial: string;
  model: string;
  volumeL: number;
  heatSource: HeatSource;
  home: { id: string; reference: string; town: string; addressLine: string } | null;
  lastSeenAt: string | null;
  /** Null when withheld (see quality). */ soc: number | null;
  v40L: number | null;
  /** Measured, estimated (sensors left out) or withheld, and why: the writer's, from the thermal core. */
  quality: FiguresQuality;
  topC: number | null;
  status: TankStatus;
  attention: AttentionKind[];
}
export interface TankListResponse {
  items: TankListItem[];
  total: number;
  page: number;
  pageSize: number;
}

/** One unresolved alert of the tank, as the alert inbox holds it. */
export interface AttentionItem {
  kind: AttentionKind;
  label: string;
  /** The alert's evidence in one sentence. */
  detail: string;
  alertId: string;
  severity: AlertSeverity;
  state: 'open' | 'acknowledged';
  openedAt: string;
  /** Telemetry time the evidence points at, epoch ms. */
  at: number;
}

export interface TankDetail {
  id: string;
  serial: string;
  model: string;
  volumeL: number;
  heightM: number;
  sensorCount: number;
  positionsM: number[];
  heatSource: HeatSource;
  hpOutputW: number;
  immersionRatingW: number;
  targetC: number;
  hysteresisK: number;
  home: TankRecord['home'];
  latest: {
    ts: string | null;
    lastSeenAt: string | null;
    online: boolean | null;
    layersC: (number | null)[];
    flowC: number | null;
    returnC: number | null;
    compressor: boolean | null;
    immersionW: number | null;
    powerW: number | null;
    drawLpm: number | null;
  } | null;
  figures: ColumnFigures | null;
  /** Energy still to add to bring every layer to the target, kWh (thermal core). */
  toFullKWh: number | null;
  status: TankStatus;
  attention: AttentionItem[];
  commissioning: {
    commissionedAt: string | null;
    heatSource: HeatSource;
    targetC: number;
    hysteresisK: number;
    hpOutputW: number;
    immersionRatingW: number;
    sensorCount: number;
    declaredLossW: number | null;
    declaredClass: string | null;
  };
  analysis: TankAnalysis;
}

export interface TankAnalysis {
  windowFrom: string;
  windowTo: string;
  standingLoss: {
    uaWPerK: number;
    lossWAt45K: number;
    kWhPer24hAt45K: number;
    impliedClass: string;
    declaredClass: string | null;
    periodFrom: string;
    periodTo: string;
    ambientC: number;
    rmsResidualK: number;
  } | null;
  standingLossNote: string;
  legionella: {
    thresholdC: number;
    holdMin: number;
    minutesAtOrAbove: number[];
    longestStretchMin: number[];
    heldFraction: number;
    readings: number;
  } | null;
  /** Whether the window's columns were measured, estimated (sensors left out) or all withheld. */
  quality: WindowQuality;
}

/** The quality of figures over a window: the sensors left out in any reading used, and why. */
export interface WindowQuality {
  status: FiguresStatus;
  leftOut: number[];
  reason: string | null;
}
/** One reading's figures quality: the sensors left out when estimated or withheld, and why when withheld. */
export interface PointQuality {
  status: FiguresStatus;
  leftOut?: number[];
  reason?: string;
}

export interface ReadingsResponse {
  tankId: string;
  from: string;
  to: string;
  resolution: Resolution;
  sensorCount: number;
  positionsM: number[];
  /** Epoch ms of each reading (raw) or bucket start (rollups). */
  t: number[];
  /** °C per layer, bottom to top: layers[layer][i]. */
  layers: (number | null)[][];
  soc: (number | null)[];
  v40L: (number | null)[];
  /** 1/0 per raw reading; the share of the bucket for rollups. */
  compressor: (number | null)[];
  immersion: (number | null)[];
  drawLpm: (number | null)[];
  flowC: (number | null)[];
  /** State of charge and V40 above: measured, estimated (sensors left out) or withheld over the range. */
  quality: WindowQuality;
  /** Each point's own quality (null where it had no layers), so a page merging polls can work out `quality` again. */
  qualityAt: (PointQuality | null)[];
}

export type TimelineKind = 'compressor_run' | 'immersion_run' | 'draw' | 'command';
export interface TimelineEvent {
  kind: TimelineKind;
  startedAt: string;
  endedAt: string | null;
  energyWh: number | null;
  litres: number | null;
  complete: boolean;
  /** Compressor runs only: this start came sooner after the previous one than the short-cycle gap. */
  shortCycle: boolean;
  /** Commands: what and how far it got. */
  command?: { id: string; kind: string; state: string; params: Record<string, unknown> };
}
export interface EventsResponse {
  tankId: string;
  from: string;
  to: string;
  items: TimelineEvent[];
  shortCycleStarts: number;
  minStartGapMin: number;
}

export interface FleetSummary {
  tanks: number;
  reporting: number;
  offline: number;
  needingAttention: number;
  byAttention: Record<AttentionKind, number>;
  /** Tanks by state of charge in tenths: bins[0] is 0–10 %, … bins[9] 90–100 %. */
  socBins: number[];
  /** Tanks by V40 in 50-litre steps; the last bin is open-ended. */
  v40Bins: { fromL: number; toL: number | null; count: number }[];
  meanSoc: number | null;
  totalV40L: number;
  /** Tanks whose latest figures are measured, estimated (a sensor left out) or withheld. */
  figuresQuality: Record<FiguresStatus, number>;
  /** The tanks to deal with first, most urgent first. */
  queue: TankListItem[];
  computedAt: string;
}
