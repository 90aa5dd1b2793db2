// The web process's own MQTT connection (service account): it publishes commands to tanks and
// tells the broker when a device token was rotated. One lazy connection per process.
import mqtt, { type MqttClient } from 'mqtt';
import { env } from '../server/env';
import { SERVICE_USERNAME, servicePassword } from './device-token';

let client: Promise<MqttClient> | null = null;

function connection(): Promise<MqttClient> {
  client ??= (async () => {
    const e = env();
    const c = await mqtt.connectAsync(e.MQTT_URL, {
      username: SERVICE_USERNAME,
      password: servicePassword(e),
      clientId: `heatlayer-web-${process.pid}-${Date.now().toString(36)}`,
      protocolVersion: 4,
      clean: true,
      reconnectPeriod: 1000,
      connectTimeout: 5000,
    });
    c.on('error', (err) => console.error('[mqtt] web publisher:', err.message));
    return c;
  })().catch((err) => {
    client = null;
    throw err;
  });
  return client;
}

/** Publishes with QoS 1 and resolves once the broker has accepted it; rejects after `timeoutMs`. */
export async function publishAsService(topic: string, payload: string, timeoutMs = 5000): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(
      () => reject(new Error(`the broker did not accept the message within ${timeoutMs / 1000} s`)),
      timeoutMs,
    );
  });
  try {
    await Promise.race([
      (async () => {
        const c = await connection();
        await c.publishAsync(topic, payload, { qos: 1 });
      })(),
      timeout,
    ]);
  } finally {
    clearTimeout(timer);
  }
}
