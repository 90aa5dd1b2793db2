// One simulated tank's network side: an MQTT client logged in as the tank (serial + device token)
// with its last will on the status topic, a persistent session so commands wait while it is
// offline, an outbox for readings taken while the network is down (sent as one backlog batch when
// it is back), and replies to commands.
//
// A device fails alone: every publish has a deadline, a reading that cannot go now waits in the
// outbox (sent as a backlog once the device is connected again), nothing here throws at the fleet
// or waits on the broker without a limit, and trouble is logged once (`TroubleLog`).
import mqtt, { type MqttClient } from 'mqtt';
import { commandMessageSchema, limits, topicFor, type Reading } from '../src/lib/telemetry/wire';
import type { SimTank } from './sim-tank';
import { TroubleLog } from './trouble';

export interface DeviceOptions {
  mqttUrl: string;
  token: string;
  /** The simulated clock, epoch ms (commands are applied at this time). */
  now: () => number;
  log?: (line: string) => void;
  /** How long a publish may wait for its PUBACK before the device counts as failing (default 10 s). */
  sendTimeoutMs?: number;
}

const wire = (r: Reading) => ({ ...r, ts: r.ts });
/** A controller's buffer: a week of minute readings; older ones are dropped first. */
const OUTBOX_LIMIT = 7 * 1440;
const message = (err: unknown) => (err instanceof Error ? err.message : String(err));

export class SimDevice {
  private client: MqttClient | null = null;
  private outbox: Reading[] = [];
  private offline = false;
  /** A publish of readings is under way: new readings wait in the outbox meanwhile. */
  private sending = false;
  readonly serial: string;
  readonly trouble: TroubleLog;

  constructor(
    readonly tank: SimTank,
    private readonly o: DeviceOptions,
  ) {
    this.serial = tank.demo.serial;
    this.trouble = new TroubleLog(this.serial, o.log);
  }

  /**
   * Connects in the background and keeps reconnecting. Resolves once connected and subscribed to
   * its commands, or once the first attempt has failed (logged once); it never rejects.
   */
  connect(): Promise<void> {
    const client = mqtt.connect(this.o.mqttUrl, {
      clientId: this.serial,
      username: this.serial,
      password: this.o.token,
      protocolVersion: 4,
      clean: false,
      reconnectPeriod: 2000,
      connectTimeout: 10_000,
      keepalive: 60,
      reconnectOnConnackError: true,
      will: { topic: topicFor(this.serial, 'status'), payload: Buffer.from('offline'), qos: 1, retain: true },
    });
    this.client = client;
    client.on('error', (err) => this.trouble.fail(err.message));
    client.on(
      'message',
      (_topic, payload) =>
        void this.onCommand(payload).catch((err) => this.trouble.fail(`a command reply failed: ${message(err)}`)),
    );
    return new Promise<void>((resolve) => {
      // The first attempt failed: an error (refused login, no broker) or a close (timeout).
      const settle = () => {
        client.off('error', settle);
        client.off('close', settle);
        resolve();
      };
      client.once('error', settle);
      client.once('close', settle);
      client.on('connect', () => void this.onConnected(client).finally(settle));
    });
  }

  /** On every (re)connection: the command subscription (a restarted broker has forgotten it), `online`, then the backlog. */
  private async onConnected(client: MqttClient): Promise<void> {
    try {
      await this.deadline(
        client.subscribeAsync(topicFor(this.serial, 'commands'), { qos: 1 }),
        'subscribing to commands',
      );
      await this.deadline(
        client.publishAsync(topicFor(this.serial, 'status'), 'online', { qos: 1, retain: true }),
        'publishing online',
      );
    } catch (err) {
      this.trouble.fail(message(err));
      return;
    }
    await this.flush();
  }

  /** Sends a live reading; keeps it in the outbox while the device is offline, not connected or still sending. Never rejects. */
  async send(reading: Reading): Promise<void> {
    this.keep([reading]);
    await this.flush();
  }

  /** Sends readings as backlog batches of at most the contract's batch size (those not sent wait in the outbox). Never rejects. */
  async sendBatch(readings: readonly Reading[]): Promise<void> {
    this.keep(readings);
    await this.flush();
  }

  private keep(readings: readonly Reading[]): void {
    this.outbox.push(...readings);
    if (this.outbox.length > OUTBOX_LIMIT) this.outbox.splice(0, this.outbox.length - OUTBOX_LIMIT);
  }

  /** Sends the outbox while connected: one reading alone, more as batches. Readings leave it only once acknowledged. */
  private async flush(): Promise<void> {
    const client = this.client;
    if (this.sending || this.offline || !client?.connected) return;
    this.sending = true;
    try {
      while (this.outbox.length > 0 && client.connected && !this.offline) {
        const batch = this.outbox.slice(0, limits.maxBatch);
        const body = batch.length === 1 ? wire(batch[0]) : { readings: batch.map(wire) };
        await this.deadline(
          client.publishAsync(topicFor(this.serial, 'telemetry'), JSON.stringify(body), { qos: 1 }),
          'waiting for the broker to acknowledge a reading',
        );
        this.outbox.splice(0, batch.length);
        this.trouble.ok();
      }
    } catch (err) {
      // mqtt.js keeps an unacknowledged QoS 1 message and sends it again on reconnection; the
      // outbox sends it too, which the contract makes harmless (a reading is identified by its ts).
      this.trouble.fail(message(err));
    } finally {
      this.sending = false;
    }
  }

  /** `work`, or a rejection once the send timeout has passed. */
  private deadline<T>(work: Promise<T>, what: string): Promise<T> {
    const ms = this.o.sendTimeoutMs ?? 10_000;
    let timer: NodeJS.Timeout | undefined;
    const late = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new Error(`no answer from the broker after ${ms / 1000} s ${what}`)), ms);
    });
    return Promise.race([work, late]).finally(() => clearTimeout(timer));
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
          method: 'POST',
          body,
          headers: { authorization: `Bearer ${this.o.token}`, 'content-type': 'application/json' },
        }).catch(() => null);
        if (res?.status === 202) {
          await res.arrayBuffer();
          break;
        }
        if (res && res.status < 500 && res.status !== 429)
          throw new Error(`${this.serial}: backfill refused with ${res.status}: ${await res.text()}`);
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

  /** Back online: reconnect; the outbox goes as a backlog once connected. */
  async goOnline(): Promise<void> {
    if (!this.offline) return;
    this.offline = false;
    await this.client?.endAsync(true).catch(() => undefined);
    await this.connect();
  }

  /** Readings waiting to be sent. */
  get waiting(): number {
    return this.outbox.length;
  }

  get isOffline(): boolean {
    return this.offline;
  }

  /** Disconnects, waiting (within the send timeout) for what is in flight. */
  async close(): Promise<void> {
    const client = this.client;
    this.client = null;
    if (!client) return;
    await this.deadline(client.endAsync(), 'closing')
      .catch(() => client.endAsync(true))
      .catch(() => undefined);
  }

  private async reply(
    commandId: string,
    state: 'acknowledged' | 'applied' | 'rejected',
    detail?: string,
  ): Promise<void> {
    if (!this.client) return;
    await this.deadline(
      this.client.publishAsync(
        topicFor(this.serial, 'replies'),
        JSON.stringify({ commandId, state, at: this.o.now(), ...(detail ? { detail } : {}) }),
        { qos: 1 },
      ),
      'replying to a command',
    );
  }

  private async onCommand(payload: Buffer): Promise<void> {
    let body: unknown;
    try {
      body = JSON.parse(payload.toString('utf8'));
    } catch {
      return;
    }
    const parsed = commandMessageSchema.safeParse(body);
    const id = typeof (body as { id?: unknown })?.id === 'string' ? (body as { id: string }).id : null;
    if (!parsed.success) {
      if (id) await this.reply(id, 'rejected', 'The command is not one this controller understands.');
      return;
    }
    const msg = parsed.data;
    if (msg.expiresAt < Date.now()) {
      await this.reply(msg.id, 'rejected', 'The command expired before it arrived.');
      return;
    }
    await this.reply(msg.id, 'acknowledged');
    const refusal = this.tank.apply(msg.command, this.o.now());
    await this.reply(msg.id, refusal ? 'rejected' : 'applied', refusal ?? undefined);
    this.o.log?.(`[simulator] ${this.serial} applied ${msg.command.kind}`);
  }
}
