// The fleet: every simulated tank connected as its own MQTT client; the last days backfilled
// through the batch path at first start (progress printed), then live, one reading a simulated
// minute each. Tank states are saved so a restart carries on where it stopped.
//
// Each tank runs alone: the clock's tick steps every tank and hands each its reading without
// waiting for any send, so a tank that cannot send (a rotated token, a lost connection) keeps its
// readings in its outbox and says so once, while the others carry on.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import type { DemoTank } from '../src/lib/demo/scenario';
import { demoDeviceToken } from '../src/lib/telemetry/device-token';
import type { Reading } from '../src/lib/telemetry/wire';
import { SimDevice } from './device';
import { SimTank, type SimTankSnapshot } from './sim-tank';

const MIN = 60_000;

export interface FleetOptions {
  tanks: readonly DemoTank[];
  mqttUrl: string;
  tokenKey: string;
  /** Simulated seconds per real second. */
  speed: number;
  backfillDays: number;
  /** The HTTP batch endpoint for the backfill (`…/api/ingest`); null sends it over MQTT. */
  ingestUrl: string | null;
  /** Where tank states are kept between runs. */
  stateFile: string | null;
  log: (line: string) => void;
  /** How long one publish may wait for its acknowledgement (default 10 s). */
  sendTimeoutMs?: number;
}

interface SavedState {
  savedAt: number;
  lastTs: number;
  tanks: Record<string, SimTankSnapshot>;
}

const floorMinute = (t: number) => Math.floor(t / MIN) * MIN;

function loadState(file: string | null): SavedState | null {
  if (!file || !existsSync(file)) return null;
  try {
    return JSON.parse(readFileSync(file, 'utf8')) as SavedState;
  } catch {
    return null;
  }
}

function saveState(file: string | null, devices: readonly SimDevice[], lastTs: number): void {
  if (!file) return;
  const state: SavedState = {
    savedAt: Date.now(),
    lastTs,
    tanks: Object.fromEntries(devices.map((d) => [d.serial, d.tank.snapshot()])),
  };
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(`${file}.tmp`, JSON.stringify(state));
  renameSync(`${file}.tmp`, file);
}

/** Runs `tasks` with at most `limit` at a time. */
async function pool<T>(items: readonly T[], limit: number, task: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(limit, items.length) }, async () => {
      while (next < items.length) await task(items[next++]);
    }),
  );
}

export class Fleet {
  readonly devices: SimDevice[];
  private simNow: number;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;

  constructor(private readonly o: FleetOptions) {
    this.simNow = floorMinute(Date.now());
    this.devices = o.tanks.map(
      (t) =>
        new SimDevice(new SimTank(t), {
          mqttUrl: o.mqttUrl,
          token: demoDeviceToken(o.tokenKey, t.serial),
          now: () => this.simNow,
          log: o.log,
          sendTimeoutMs: o.sendTimeoutMs,
        }),
    );
  }

  /** Connects every tank; one that cannot connect has said why and keeps trying on its own. */
  async connect(): Promise<void> {
    await pool(this.devices, 32, (d) => d.connect());
    const failing = this.devices.filter((d) => d.trouble.failing).length;
    this.o.log(
      `[simulator] ${this.devices.length - failing} of ${this.devices.length} tanks connected to ${this.o.mqttUrl}`,
    );
  }

  /**
   * Fills the stored history: from the saved state's last minute when there is one (a restart), or
   * `backfillDays` ago, up to now. Day by day across the fleet, each tank's day as backlog batches.
   */
  async backfill(): Promise<void> {
    const saved = loadState(this.o.stateFile);
    const earliest = floorMinute(Date.now()) - this.o.backfillDays * 86_400_000;
    let from = earliest;
    if (saved && saved.lastTs > earliest) {
      for (const d of this.devices) {
        const s = saved.tanks[d.serial];
        if (s) d.tank.restore(s);
      }
      from = saved.lastTs + MIN;
    }
    // A long backfill falls behind the clock while it runs: fill again up to the new "now" until the
    // gap is under two minutes, so that live readings carry the real time.
    for (;;) {
      const filledTo = await this.fillRange(from);
      if (this.stopped || floorMinute(Date.now()) - filledTo < 2 * MIN) break;
      from = filledTo;
    }
  }

  /** Backfills every tank from `from` to now; returns the end of what it filled (exclusive). */
  private async fillRange(from: number): Promise<number> {
    const now = floorMinute(Date.now());
    const minutes = Math.max(0, Math.round((now - from) / MIN));
    if (minutes === 0) {
      this.simNow = from - MIN;
      return from;
    }
    const total = minutes * this.devices.length;
    this.o.log(
      `[simulator] backfilling ${(minutes / 1440).toFixed(1)} days × ${this.devices.length} tanks = ${total.toLocaleString('en-GB')} readings through the batch path…`,
    );
    const started = Date.now();
    let sent = 0;
    let lastReport = 0;
    const refused = new Set<SimDevice>();
    const report = (force = false) => {
      const elapsed = (Date.now() - started) / 1000;
      if (!force && Date.now() - lastReport < 5000) return;
      lastReport = Date.now();
      const rate = sent / Math.max(elapsed, 0.001);
      const pct = (100 * sent) / total;
      const bar = '#'.repeat(Math.round(pct / 5)).padEnd(20, '.');
      this.o.log(
        `[simulator] backfill [${bar}] ${pct.toFixed(0)}% ${sent.toLocaleString('en-GB')}/${total.toLocaleString('en-GB')} readings, ${Math.round(rate).toLocaleString('en-GB')}/s${sent < total ? `, about ${Math.ceil((total - sent) / Math.max(rate, 1) / 60)} min left` : ''}`,
      );
    };
    for (let dayStart = from; dayStart < now && !this.stopped; dayStart += 86_400_000) {
      const dayEnd = Math.min(now, dayStart + 86_400_000);
      // Over HTTP a few requests at a time keep the writer busy without queueing behind it.
      const url = this.o.ingestUrl;
      await pool(this.devices, url ? 4 : 16, async (d) => {
        const readings: Reading[] = [];
        for (let t = dayStart; t < dayEnd; t += MIN) readings.push(d.tank.step(t));
        if (url && !refused.has(d)) {
          // A tank the server refuses (e.g. its token was rotated) is left out; the rest go on.
          await d.postBatch(url, readings).catch((err) => {
            refused.add(d);
            d.trouble.fail(err instanceof Error ? err.message : String(err));
          });
        } else if (!url) await d.sendBatch(readings);
        sent += readings.length;
        report();
      });
    }
    this.simNow = now - MIN; // the first live tick sends the minute `now`
    saveState(this.o.stateFile, this.devices, now - MIN);
    report(true);
    this.o.log(`[simulator] backfill done in ${Math.round((Date.now() - started) / 1000)} s`);
    return now;
  }

  /**
   * One simulated minute for every tank: each steps its model now, in clock order, and sends its
   * reading on its own (a send that is slow or fails holds only that tank; readings it cannot send
   * wait in its outbox). Nothing here waits for the network.
   */
  tick(): void {
    this.simNow += MIN;
    const t = this.simNow;
    const stamp = this.o.speed === 1 ? t : Date.now();
    for (const d of this.devices) {
      // network_outage: off the network for 30 simulated minutes twice a day, then the backlog.
      if (d.tank.faults.has('network_outage')) {
        const minuteOfDay = Math.floor((t % 86_400_000) / MIN);
        const out =
          (minuteOfDay >= 14 * 60 && minuteOfDay < 14 * 60 + 30) ||
          (minuteOfDay >= 2 * 60 && minuteOfDay < 2 * 60 + 30);
        if (out && !d.isOffline) d.goOffline();
        if (!out && d.isOffline) void d.goOnline();
      }
      const r = d.tank.step(t);
      void d.send({ ...r, ts: stamp });
    }
  }

  live(): void {
    const periodMs = MIN / this.o.speed;
    let ticks = 0;
    this.timer = setInterval(() => {
      if (this.stopped) return;
      this.tick();
      if (++ticks % 5 === 0) saveState(this.o.stateFile, this.devices, this.simNow);
    }, periodMs);
  }

  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    if (this.o.speed === 1) saveState(this.o.stateFile, this.devices, this.simNow);
    await pool(this.devices, 64, (d) => d.close());
  }
}
