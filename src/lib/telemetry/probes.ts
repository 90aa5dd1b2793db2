// Readiness probes for the process list (scripts/lib/services.ts): the broker answers a service
// login, and an ingest worker has announced itself on its retained status topic.
import mqtt from 'mqtt';
import { SERVICE_USERNAME } from './device-token';
import { INGEST_STATUS_TOPIC, topicFor } from './wire';

const connect = (url: string, password: string) =>
  mqtt.connectAsync(url, {
    username: SERVICE_USERNAME,
    password,
    clientId: `heatlayer-probe-${process.pid}-${Date.now()}`,
    reconnectPeriod: 0,
    connectTimeout: 2000,
    protocolVersion: 4,
  });

export async function brokerAcceptsService(url: string, password: string): Promise<boolean> {
  const c = await connect(url, password);
  await c.endAsync();
  return true;
}

export const ingestWorkerOnline = (url: string, password: string) =>
  retainedIs(url, password, INGEST_STATUS_TOPIC, 'online');

export const tankOnline = (url: string, password: string, serial: string) =>
  retainedIs(url, password, topicFor(serial, 'status'), 'online');

async function retainedIs(url: string, password: string, topic: string, value: string): Promise<boolean> {
  const c = await connect(url, password);
  try {
    return await new Promise<boolean>((resolve) => {
      const timer = setTimeout(() => resolve(false), 1500);
      c.on('message', (t, payload) => {
        if (t === topic) {
          clearTimeout(timer);
          resolve(payload.toString() === value);
        }
      });
      c.subscribe(topic, { qos: 0 });
    });
  } finally {
    await c.endAsync();
  }
}
