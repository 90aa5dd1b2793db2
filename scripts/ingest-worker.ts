// The ingest worker process (`npm start` and the tests start it): MQTT → validation → PostgreSQL,
// and gateways' HTTP batches on INGEST_PORT (the web forwards its /api/ingest there),
// plus the periodic jobs that belong with the data: rollups, each tank's energy per day, partition
// upkeep and retention.
import { closeDb, getPool } from '../src/db';
import { refreshRollups, runRetention, setReadingsRetention } from '../src/db/queries/rollups';
import { env } from '../src/lib/server/env';
import { SERVICE_USERNAME, servicePassword } from '../src/lib/telemetry/device-token';
import { IngestWorker } from '../src/lib/telemetry/ingest-worker.server';
import { listenForIngest } from '../src/lib/telemetry/ingest-listener.server';
import { AlertClock, BatchEvaluator } from '../src/lib/alerts/runner.server';
import { ENERGY_DAYS_KEPT, catchUpEnergyDays, pruneEnergyDays } from '../src/lib/tank-energy/energy-days.server';

const ROLLUP_EVERY_MS = 30_000;
const RETENTION_EVERY_MS = 3_600_000;
const DEAD_LETTER_DAYS = 30;

async function main(): Promise<void> {
  const e = env();
  const worker = new IngestWorker({
    mqttUrl: e.MQTT_URL,
    username: SERVICE_USERNAME,
    password: servicePassword(e),
    pool: getPool(),
    retentionDays: e.READINGS_RETENTION_DAYS,
  });
  // Alert rules run on each committed batch's tanks, and on a clock for the time-based ones.
  const alerts = new BatchEvaluator();
  worker.on('committed', (info: { inserted: number; topics: string[] }) => {
    if (info.inserted > 0) alerts.evaluateOnBatch(info.topics);
  });
  const alertClock = new AlertClock(e.ALERTS_CLOCK_MS);
  alertClock.start();
  worker.start();
  const http = await listenForIngest(e.HOST, e.INGEST_PORT);
  console.log(`[ingest] HTTP ingest on http://${e.HOST}:${e.INGEST_PORT}/api/ingest`);

  let retentionSet = false;
  let lastRetention = 0;
  // One run at a time: after a backfill a run can outlast the interval, and overlapping runs would
  // only compete for the same cores and rows.
  let running = false;
  const jobs = async () => {
    if (running) return;
    running = true;
    try {
      if (!retentionSet) {
        await setReadingsRetention(e.READINGS_RETENTION_DAYS);
        retentionSet = true;
      }
      if (Date.now() - lastRetention > RETENTION_EVERY_MS) {
        await runRetention({ rollupDays: e.ROLLUPS_RETENTION_DAYS, deadLetterDays: DEAD_LETTER_DAYS });
        await pruneEnergyDays(ENERGY_DAYS_KEPT);
        lastRetention = Date.now();
      }
      // Catch up in slices so one call never holds a long transaction (a backfill leaves many buckets).
      for (let i = 0; i < 50 && (await refreshRollups(2000)) > 0; i++);
      // Then the days those rollups closed (the fleet's energy figures read them).
      await catchUpEnergyDays();
    } catch (err) {
      console.error(`[ingest] periodic job failed (will retry): ${err instanceof Error ? err.message : String(err)}`);
    } finally {
      running = false;
    }
  };
  const timer = setInterval(() => void jobs(), ROLLUP_EVERY_MS);
  setTimeout(() => void jobs(), 5_000).unref();

  const report = setInterval(() => {
    const s = worker.stats;
    if (s.messages > 0)
      console.log(
        `[ingest] ${s.messages} messages, ${s.inserted} readings stored, ${s.duplicates} duplicates, ${s.deadLetters} dead letters, ${worker.buffered} buffered`,
      );
  }, 60_000);

  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    clearInterval(timer);
    clearInterval(report);
    alertClock.stop();
    await new Promise((resolve) => http.close(resolve));
    await worker.stop();
    await alerts.idle();
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
}

main().catch((err) => {
  console.error('[ingest] failed to start:', err instanceof Error ? err.message : err);
  process.exit(1);
});
