// One simulated tank's network side: an MQTT client logged in as the tank (serial + device token)
// with its last will on the status topic, a persistent session so commands wait while it is
// offline, an outbox for readings taken while the network is down (sent as one backlog batch when
// it is back), and replies to commands.
import mqtt, { type MqttClient } from 'mqtt';
import { commandMessageSchema, limits, topicFor, type Reading } from '../src/lib/telemetry/wire';
import type { SimTank } from './sim-tank';

export interface DeviceOptions {
  mqttUrl: string;
  token: string;
  /** The simulated clock, epoch ms (commands are applied at this time). */
  now: () => number;
  log?: (line: string) => void;
}

const wire = (r: Reading) => ({ ...r, ts: r.ts });

export class SimDevice {
  private client: MqttClient | null = null;
  private outbox: Reading[] = [];
  private offline = false;
  readonly serial: string;

  constructor(readonly tank: SimTank, private readonly o: DeviceOptions) {
    this.serial = tank.demo.serial;
  }

  async connect(): Promise<void> {
    const status = topicFor(this.serial, 'status');
    this.client = await mqtt.connectAsync(this.o.mqttUrl, {
      clientId: this.serial, username: this.serial, password: this.o.token, protocolVersion: 4, clean: false,
      reconnectPeriod: 2000, connectTimeout: 10_000, keepalive: 60, reconnectOnConnackError: true,
      will: { topic: status, payload: Buffer.from('offline'), qos: 1, retain: true },
    });
    this.client.on('connect', () => void this.client?.publishAsync(status, 'online', { qos: 1, retain: true }).catch(() => undefined));
    this.client.on('error', (err) => this.o.log?.(`[simulator] ${this.serial}: ${err.message}`));
    this.client.on('message', (_topic, payload) => void this.onCommand(payload));
    await this.client.subscribeAsync(topicFor(this.serial, 'commands'), { qos: 1 });
    await this.client.publishAsync(status, 'online', { qos: 1, retain: true });
  }

  /** Sends a live reading, or keeps it in the outbox while the network is down. */
  async send(reading: Reading): Promise<void> {
    if (this.offline || !this.client) { this.outbox.push(reading); return; }
    await this.client.publishAsync(topicFor(this.serial, 'telemetry'), JSON.stringify(wire(reading)), { qos: 1 });
  }

  /** Sends readings as backlog batches of at most the contract's batch size, in order. */
  async sendBatch(readings: readonly Reading[], batchSize: number = limits.maxBatch): Promise<void> {
    if (!this.client) throw new Error(`${this.serial} is not connected.`);
    for (let i = 0; i < readings.length; i += batchSize) {
      await this.client.publishAsync(topicFor(this.serial, 'telemetry'), JSON.stringify({ readings: readings.slice(i, i + batchSize).map(wire) }), { qos: 1 });
    }
  }

  /**
   * Sends a backlog through the HTTP batch path (`POST /api/ingest`), one request per batch. The
   * server answers only once a batch is committed, so a large backfill goes exactly as fast as
   * the database takes it instead of piling up in the broker's memory. Retries with backoff while
   * the server is busy or down; a refusal (4xx) is a bug and stops the backfill.
   */
  async postBatch(url: string, readings: readonly Reading[], batchSize: number = limits.maxBatch): Promise<void> {
    for (let i = 0; i < readings.length; i += batchSize) {
      const body = JSON.stringify({ readings: readings.slice(i, i + batchSize).map(wire) });
      for (let attempt = 0; ; attempt++) {
        const res = await fetch(url, {
          method: 'POST', body, headers: { authorization: `Bearer ${this.o.token}`, 'content-type': 'application/json' },
        }).catch(() => null);
        if (res?.status === 202) { await res.arrayBuffer(); break; }
        if (res && res.status < 500 && res.status !== 429) throw new Error(`${this.serial}: backfill refused with ${res.status}: ${await res.text()}`);
        await res?.arrayBuffer().catch(() => undefined);
        await new Promise((r) => setTimeout(r, Math.min(30_000, 500 * 2 ** attempt)));
      }
    }
  }

  /** The network_outage fault: drop off the network (the broker publishes the last will). */
  goOffline(): void {
    if (this.offline || !this.client) return;
    this.offline = true;
    this.client.options.reconnectPeriod = 0;
    this.client.stream.destroy(); // an abrupt loss, not a clean disconnect
  }

  /** Back online: reconnect and replay the outbox as a backlog. */
  async goOnline(): Promise<void> {
    if (!this.offline) return;
    this.offline = false;
    await this.client?.endAsync(true).catch(() => undefined);
    await this.connect();
    const backlog = this.outbox;
    this.outbox = [];
    if (backlog.length) await this.sendBatch(backlog);
  }

  get isOffline(): boolean {
    return this.offline;
  }

  async close(): Promise<void> {
    await this.client?.endAsync().catch(() => undefined);
    this.client = null;
  }

  private async reply(commandId: string, state: 'acknowledged' | 'applied' | 'rejected', detail?: string): Promise<void> {
    await this.client?.publishAsync(topicFor(this.serial, 'replies'), JSON.stringify({ commandId, state, at: this.o.now(), ...(detail ? { detail } : {}) }), { qos: 1 });
  }

  private async onCommand(payload: Buffer): Promise<void> {
    let body: unknown;
    try { body = JSON.parse(payload.toString('utf8')); } catch { return; }
    const parsed = commandMessageSchema.safeParse(body);
    const id = typeof (body as { id?: unknown })?.id === 'string' ? (body as { id: string }).id : null;
    if (!parsed.success) { if (id) await this.reply(id, 'rejected', 'The command is not one this controller understands.'); return; }
    const msg = parsed.data;
    if (msg.expiresAt < Date.now()) { await this.reply(msg.id, 'rejected', 'The command expired before it arrived.'); return; }
    await this.reply(msg.id, 'acknowledged');
    const refusal = this.tank.apply(msg.command, this.o.now());
    await this.reply(msg.id, refusal ? 'rejected' : 'applied', refusal ?? undefined);
    this.o.log?.(`[simulator] ${this.serial} applied ${msg.command.kind}`);
  }
}
