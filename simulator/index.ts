// The fleet simulator (`npm run simulator`, and started by `npm start`): plays the demo fleet of
// src/lib/demo/scenario.ts as real tanks would, faults included. It reads no database: it derives
// each demo tank's device token from DEVICE_TOKEN_SEED, as the seed did.
//   SIMULATOR_TANKS          tanks simulated per demo company (default 240: the whole demo fleet)
//   SIMULATOR_SPEED          simulated seconds per real second (default 1)
//   SIMULATOR_BACKFILL_DAYS  history filled at first start (default 14)
import { join } from 'node:path';
import { demoCompanies, demoTanks } from '../src/lib/demo/scenario';
import { env } from '../src/lib/server/env';
import { Fleet } from './fleet';

async function main(): Promise<void> {
  const e = env();
  if (!e.DEVICE_TOKEN_SEED)
    throw new Error(
      'DEVICE_TOKEN_SEED is not set: start the simulator through `npm start`, or set it to the key the demo seed used.',
    );
  const all = demoTanks();
  const tanks = demoCompanies.flatMap((c) => all.filter((t) => t.companySlug === c.slug).slice(0, e.SIMULATOR_TANKS));
  const fleet = new Fleet({
    tanks,
    mqttUrl: e.MQTT_URL,
    tokenKey: e.DEVICE_TOKEN_SEED,
    speed: e.SIMULATOR_SPEED,
    backfillDays: e.SIMULATOR_BACKFILL_DAYS,
    // Straight to the ingest tier, as a gateway would: the backfill never takes the web server's time.
    ingestUrl: `${e.INGEST_URL}/api/ingest`,
    stateFile: e.SIMULATOR_SPEED === 1 ? join(e.HEATLAYER_DATA_DIR, 'simulator-state.json') : null,
    log: (line) => console.log(line),
  });
  const faulty = tanks.filter((t) => t.faults.length).map((t) => `${t.serial} (${t.faults.join(', ')})`);
  console.log(
    `[simulator] ${tanks.length} tanks at ${e.SIMULATOR_SPEED}× speed; injected faults: ${faulty.join('; ') || 'none'}`,
  );
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await fleet.stop();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
  await fleet.connect();
  await fleet.backfill();
  console.log('[simulator] now live');
  fleet.live();
}

main().catch((err) => {
  console.error('[simulator] failed:', err instanceof Error ? err.message : err);
  process.exit(1);
});
