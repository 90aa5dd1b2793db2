import {
  bigserial,
  boolean,
  customType,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  real,
  smallint,
  text,
  timestamp,
  uuid,
} from 'drizzle-orm/pg-core';
import { users } from './auth';
import { tanks } from './homes';
import { eventKinds, type DeriveState } from '../../lib/telemetry/events';
import type { FiguresQuality, StuckState } from '../../lib/thermal/index.js';

/**
 * Telemetry tables. Every key starts with the tank id so that the tables could later be
 * distributed by tank across nodes (the one exception: dead letters of messages that could not be
 * attributed to any tank, which are rare and small).
 *
 * Temperatures are stored as smallint centi-degrees (°C × 100): two bytes a sensor instead of four
 * for real, exact to 0.01 K (far finer than the ±0.2 K or so of a cylinder NTC), and the range
 * ±327 °C holds anything a cylinder can report. A 12-sensor reading is about 60 bytes of row data.
 */

/** Raw bytes (the dead-lettered payload exactly as it arrived). */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

/**
 * One reading of one tank. Range-partitioned by `ts`, one partition a day, managed by pg_partman
 * (see drizzle/0003_readings_partitioned.sql); drizzle-kit cannot express partitioning, so this
 * definition only gives typed queries. No foreign key to tanks: the writer only stores readings of
 * tanks it has just looked up, and a per-row check would slow COPY down.
 */
export const readings = pgTable(
  'readings',
  {
    tankId: uuid('tank_id').notNull(),
    ts: timestamp('ts', { withTimezone: true }).notNull(),
    /** The device's own counter, if it sends one. */
    seq: integer('seq'),
    /** Layer temperatures bottom to top, centi-degrees; null elements are sensors the device found open or shorted. */
    layersCc: smallint('layers_cc').array().notNull(),
    flowCc: smallint('flow_cc'),
    returnCc: smallint('return_cc'),
    compressor: boolean('compressor'),
    immersionW: smallint('immersion_w'),
    powerW: smallint('power_w'),
    pumpPct: smallint('pump_pct'),
    /** Hot-water draw, decilitres per minute (0.1 l/min). */
    drawDlpm: smallint('draw_dlpm'),
    /** Solar power beyond the household's own use, before diversion to the immersion, W (added by drizzle/0007). */
    solarSurplusW: smallint('solar_surplus_w'),
  },
  (t) => [primaryKey({ columns: [t.tankId, t.ts] })],
);
export type ReadingRow = typeof readings.$inferSelect;

/** The newest reading of each tank and what follows from it, so "now" never scans readings. */
export const tankLatestState = pgTable(
  'tank_latest_state',
  {
    tankId: uuid('tank_id')
      .primaryKey()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    /** Time of the newest reading (device clock). */
    ts: timestamp('ts', { withTimezone: true }),
    /** When anything (reading or status) last arrived from the tank (server clock). */
    lastSeenAt: timestamp('last_seen_at', { withTimezone: true }),
    seq: integer('seq'),
    layersCc: smallint('layers_cc').array(),
    flowCc: smallint('flow_cc'),
    returnCc: smallint('return_cc'),
    compressor: boolean('compressor'),
    immersionW: smallint('immersion_w'),
    powerW: smallint('power_w'),
    pumpPct: smallint('pump_pct'),
    drawDlpm: smallint('draw_dlpm'),
    /** State of charge 0–1 against the tank's target, from the home's cold inlet (else 10 °C); null when withheld. */
    soc: real('soc'),
    /** Litres of mixed water at 40 °C (EN 16147 V40, from the home's cold inlet, else 10 °C); null when withheld. */
    v40L: real('v40_l'),
    /** Whether soc and V40 were measured, estimated (sensors left out) or withheld, and why (thermal `tankFigures`). */
    figuresQuality: jsonb('figures_quality').$type<FiguresQuality>(),
    /** The stuck-sensor check carried between batches (thermal `stepStuck`). */
    sensorCheck: jsonb('sensor_check').$type<StuckState>(),
    /** From the retained status topic (the device's last will says offline). */
    online: boolean('online'),
    statusAt: timestamp('status_at', { withTimezone: true }),
    /** Open runs the incremental event derivation carries between batches (src/lib/telemetry/events.ts). */
    derive: jsonb('derive').$type<DeriveState>().notNull().default({ lastTs: null, open: {} }),
  },
  (t) => [
    // The tank list's sorts walk these in either direction and stop after one page.
    index('tank_latest_state_soc_idx').on(t.soc),
    index('tank_latest_state_v40_idx').on(t.v40L),
    index('tank_latest_state_last_seen_idx').on(t.lastSeenAt),
  ],
);
export type TankLatestState = typeof tankLatestState.$inferSelect;

export { eventKinds };
export const eventKindEnum = pgEnum('telemetry_event_kind', eventKinds);

/** Compressor runs, immersion runs and hot-water draws, derived from readings as they arrive. */
export const telemetryEvents = pgTable(
  'telemetry_events',
  {
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    kind: eventKindEnum('kind').notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    /** Null while the run is still going. */
    endedAt: timestamp('ended_at', { withTimezone: true }),
    /** Electricity used during the run (from powerW / immersionW), Wh. */
    energyWh: real('energy_wh').notNull().default(0),
    /** Hot water drawn (draws), litres. */
    litres: real('litres').notNull().default(0),
    startTopCc: smallint('start_top_cc'),
    endTopCc: smallint('end_top_cc'),
    /** False when the run was cut by a gap in the readings rather than seen to end. */
    complete: boolean('complete').notNull().default(true),
  },
  (t) => [
    primaryKey({ columns: [t.tankId, t.kind, t.startedAt] }),
    index('telemetry_events_tank_time_idx').on(t.tankId, t.startedAt),
  ],
);
export type TelemetryEvent = typeof telemetryEvents.$inferSelect;

export const commandKinds = ['boost', 'set_target', 'set_schedule'] as const;
export type CommandKind = (typeof commandKinds)[number];
export const commandKindEnum = pgEnum('command_kind', commandKinds);
/** queued → sent (broker accepted it) → acknowledged (device received it) → applied; or rejected / failed. */
export const commandStates = ['queued', 'sent', 'acknowledged', 'applied', 'rejected', 'failed'] as const;
export type CommandState = (typeof commandStates)[number];
export const commandStateEnum = pgEnum('command_state', commandStates);

/** Commands sent to tanks and how far each got. */
export const commands = pgTable(
  'commands',
  {
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    id: uuid('id').notNull().defaultRandom(),
    kind: commandKindEnum('kind').notNull(),
    params: jsonb('params').$type<Record<string, unknown>>().notNull(),
    state: commandStateEnum('state').notNull().default('queued'),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    acknowledgedAt: timestamp('acknowledged_at', { withTimezone: true }),
    appliedAt: timestamp('applied_at', { withTimezone: true }),
    /** Why the device rejected it or why it could not be sent. */
    detail: text('detail'),
  },
  (t) => [primaryKey({ columns: [t.tankId, t.id] }), index('commands_tank_created_idx').on(t.tankId, t.createdAt)],
);
export type CommandRow = typeof commands.$inferSelect;

/** Telemetry that was refused, with the raw payload and the reason, for support and firmware fixes. */
export const deadLetters = pgTable(
  'dead_letters',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    /** Null only when the message could not be attributed to a known tank. */
    tankId: uuid('tank_id').references(() => tanks.id, { onDelete: 'cascade' }),
    serial: text('serial'),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    transport: text('transport').$type<'mqtt' | 'http'>().notNull(),
    topic: text('topic'),
    /** Permanent PascalCase reason code, e.g. InvalidJson, InvalidReading, BatchTooLarge. */
    reasonCode: text('reason_code').notNull(),
    reason: text('reason').notNull(),
    fields: jsonb('fields').$type<{ field: string; message: string }[]>().notNull().default([]),
    /** The payload as received (a batch's rejected reading: that reading alone), at most 256 KiB. */
    payload: bytea('payload').notNull(),
    payloadBytes: integer('payload_bytes').notNull(),
  },
  (t) => [index('dead_letters_tank_time_idx').on(t.tankId, t.receivedAt)],
);
export type DeadLetter = typeof deadLetters.$inferSelect;

/** Aggregates for long chart ranges; one shape for both resolutions. */
function rollupColumns() {
  return {
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    bucket: timestamp('bucket', { withTimezone: true }).notNull(),
    samples: integer('samples').notNull(),
    /** Mean of each layer over the bucket, centi-degrees, bottom to top. */
    layersAvgCc: smallint('layers_avg_cc').array().notNull(),
    topMinCc: smallint('top_min_cc'),
    topMaxCc: smallint('top_max_cc'),
    flowAvgCc: smallint('flow_avg_cc'),
    compressorSamples: integer('compressor_samples').notNull(),
    immersionSamples: integer('immersion_samples').notNull(),
    powerAvgW: real('power_avg_w'),
    drawAvgLpm: real('draw_avg_lpm'),
  };
}
export const rollups15m = pgTable('rollups_15m', rollupColumns(), (t) => [
  primaryKey({ columns: [t.tankId, t.bucket] }),
]);
export const rollups1h = pgTable('rollups_1h', rollupColumns(), (t) => [primaryKey({ columns: [t.tankId, t.bucket] })]);
export type RollupRow = typeof rollups15m.$inferSelect;

/** 15-minute buckets that received readings since the rollup job last ran (a work queue). */
export const rollupDirty = pgTable(
  'rollup_dirty',
  {
    tankId: uuid('tank_id').notNull(),
    bucket: timestamp('bucket', { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.tankId, t.bucket] })],
);
