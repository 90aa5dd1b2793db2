// The MQTT broker process (`npm start` and the tests start it): aedes on 127.0.0.1:MQTT_PORT with
// Heatlayer's device authentication. SIGTERM drains what the ingest worker has not acknowledged.
import { closeDb } from '../src/db';
import { findDeviceTokenHash } from '../src/db/queries/telemetry';
import { env } from '../src/lib/server/env';
import { startBroker } from '../src/lib/telemetry/broker.server';
import { servicePassword } from '../src/lib/telemetry/device-token';

async function main(): Promise<void> {
  const e = env();
  const broker = await startBroker({
    host: '127.0.0.1',
    port: e.MQTT_PORT,
    servicePassword: servicePassword(e),
    lookupTokenHash: findDeviceTokenHash,
    concurrency: e.BROKER_CONCURRENCY,
  });
  console.log(`[broker] MQTT 3.1.1 on 127.0.0.1:${broker.port} (concurrency ${e.BROKER_CONCURRENCY})`);
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    const { undelivered } = await broker.close({ drainMs: 4000 });
    console.log(`[broker] stopped${undelivered ? ` (${undelivered} messages undelivered)` : ''}`);
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
}

main().catch((err) => {
  console.error('[broker] failed to start:', err instanceof Error ? err.message : err);
  process.exit(1);
});
