// The MQTT ingest worker: subscribes (persistent session, QoS 1) to every tank's telemetry, status
// and command replies, validates, batches by size and time, writes through TelemetryWriter, and
// acknowledges each message only after the batch holding it has committed.
//
// While PostgreSQL is unreachable it retries the same batch with backoff and keeps nothing
// acknowledged; new messages queue in a bounded buffer, and when that is full it stops reading
// the socket, so the broker holds the rest (TCP backpressure). If the broker drops the
// connection meanwhile, every unacknowledged message is redelivered on the next one; writes are
// idempotent, so a message written twice is stored once. Bad input never throws out of here: it
// is dead-lettered with its reason and acknowledged.
import { EventEmitter } from 'node:events';
import type pg from 'pg';
import type { DeadLetterInput, IngestTank } from '../../db/queries/telemetry';
import { recordTankStatus } from '../../db/queries/telemetry';
import { recordCommandReply } from '../../db/queries/commands';
import { MqttConsumer, type InboundMessage } from './mqtt-consumer';
import { TankDirectory } from './tank-directory.server';
import {
  INGEST_CLIENT_ID,
  INGEST_STATUS_TOPIC,
  commandReplySchema,
  ingestFilters,
  parseTelemetry,
  parseTopic,
  zodFieldErrors,
  type RejectedReading,
} from './wire';
import { TelemetryWriter, type IngestItem } from './writer.server';

export interface IngestWorkerOptions {
  mqttUrl: string;
  username: string;
  password: string;
  pool: pg.Pool;
  retentionDays: number;
  clientId?: string;
  /** A batch is written when it holds this many readings… */
  batchMaxReadings?: number;
  /** …or this long after its first message arrived. */
  batchMaxWaitMs?: number;
  /** Messages held unacknowledged before the worker stops reading from the broker… */
  bufferMaxMessages?: number;
  /** …or payload bytes (backlog batches are large). */
  bufferMaxBytes?: number;
  directory?: TankDirectory;
  log?: (line: string) => void;
}

interface Pending {
  msg: InboundMessage;
  receivedAt: number;
}

export interface CommittedInfo {
  messages: number;
  readings: number;
  inserted: number;
  duplicates: number;
  deadLetters: number;
  ms: number;
  topics: string[];
  payloads: Buffer[];
}

export class IngestWorker extends EventEmitter {
  readonly stats = { messages: 0, inserted: 0, duplicates: 0, deadLetters: 0, batches: 0, retries: 0 };
  private readonly consumer: MqttConsumer;
  private readonly writer: TelemetryWriter;
  private readonly directory: TankDirectory;
  private queue: Pending[] = [];
  private queuedReadings = 0;
  private queuedBytes = 0;
  private flushing = false;
  private timer: NodeJS.Timeout | null = null;
  private epoch = 0;
  private stopped = false;
  private readonly o: Required<Omit<IngestWorkerOptions, 'directory' | 'log'>> & { log: (line: string) => void };

  constructor(opts: IngestWorkerOptions) {
    super();
    this.o = {
      clientId: INGEST_CLIENT_ID,
      batchMaxReadings: 2000,
      batchMaxWaitMs: 50,
      bufferMaxMessages: 20_000,
      bufferMaxBytes: 64 * 1024 * 1024,
      log: (line) => console.log(line),
      ...opts,
    } as typeof this.o;
    this.writer = new TelemetryWriter(opts.pool);
    this.directory = opts.directory ?? new TankDirectory();
    this.consumer = new MqttConsumer({
      url: opts.mqttUrl,
      clientId: this.o.clientId,
      username: opts.username,
      password: opts.password,
      filters: [ingestFilters.telemetry, ingestFilters.status, ingestFilters.replies],
      will: { topic: INGEST_STATUS_TOPIC, payload: 'offline', retain: true },
      onMessage: (m) => this.receive(m),
      onReady: ({ sessionPresent }) => {
        this.consumer.publish(INGEST_STATUS_TOPIC, 'online', true);
        this.o.log(
          `[ingest] subscribed to ${this.o.mqttUrl} (${sessionPresent ? 'resumed' : 'new'} persistent session)`,
        );
        this.emit('ready');
      },
      onDisconnect: (reason) => this.dropUnacknowledged(reason),
      log: this.o.log,
    });
  }

  get connected(): boolean {
    return this.consumer.connected;
  }

  start(): void {
    this.consumer.start();
  }

  /** Writes what is already buffered (if the database is up), then disconnects. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    const until = Date.now() + 5000;
    while ((this.flushing || this.queue.length > 0) && Date.now() < until) {
      if (!this.flushing) void this.flush();
      await new Promise((r) => setTimeout(r, 20));
    }
    await this.consumer.stop();
  }

  /** Messages waiting for a batch to commit. */
  get buffered(): number {
    return this.queue.length;
  }

  private receive(msg: InboundMessage): void {
    this.stats.messages++;
    this.queue.push({ msg, receivedAt: Date.now() });
    this.queuedReadings += estimatedReadings(msg);
    this.queuedBytes += msg.payload.length;
    if (this.full()) this.consumer.pause();
    if (this.queuedReadings >= this.o.batchMaxReadings) void this.flush();
    else if (!this.timer)
      this.timer = setTimeout(() => {
        this.timer = null;
        void this.flush();
      }, this.o.batchMaxWaitMs);
  }

  private full(fraction = 1): boolean {
    return (
      this.queue.length >= this.o.bufferMaxMessages * fraction || this.queuedBytes >= this.o.bufferMaxBytes * fraction
    );
  }

  /** The connection is gone: its messages will be redelivered, so forget them (never ack on a new connection). */
  private dropUnacknowledged(reason: string): void {
    this.epoch++;
    if (this.queue.length)
      this.o.log(
        `[ingest] connection lost (${reason}); ${this.queue.length} unacknowledged messages will be redelivered`,
      );
    this.queue = [];
    this.queuedReadings = 0;
    this.queuedBytes = 0;
    this.consumer.resume();
  }

  private async flush(): Promise<void> {
    if (this.flushing || this.queue.length === 0) return;
    this.flushing = true;
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = null;
    }
    const epoch = this.epoch;
    // Take up to one batch worth of messages.
    let take = 0;
    let est = 0;
    while (take < this.queue.length && (take === 0 || est < this.o.batchMaxReadings)) {
      const m = this.queue[take++];
      est += estimatedReadings(m.msg);
    }
    const batch = this.queue.slice(0, take);
    let delay = 100;
    try {
      for (;;) {
        if (epoch !== this.epoch) return; // dropped: the broker redelivers them
        try {
          const started = performance.now();
          const info = await this.process(batch);
          if (epoch !== this.epoch) return;
          for (const p of batch) p.msg.ack();
          this.queue.splice(0, batch.length);
          this.queuedReadings = Math.max(0, this.queuedReadings - est);
          this.queuedBytes = Math.max(0, this.queuedBytes - batch.reduce((n, p) => n + p.msg.payload.length, 0));
          this.stats.batches++;
          this.emit('committed', {
            ...info,
            ms: performance.now() - started,
            messages: batch.length,
            topics: batch.map((p) => p.msg.topic),
            payloads: batch.map((p) => p.msg.payload),
          } satisfies CommittedInfo);
          break;
        } catch (err) {
          this.stats.retries++;
          this.o.log(
            `[ingest] batch of ${batch.length} messages not stored (${err instanceof Error ? err.message : String(err)}); nothing acknowledged, retrying in ${delay} ms`,
          );
          await new Promise((r) => setTimeout(r, delay));
          delay = Math.min(delay * 2, 5000);
        }
      }
    } finally {
      this.flushing = false;
      if (!this.full(0.5)) this.consumer.resume();
      if (this.queue.length > 0 && !this.stopped) {
        if (this.queuedReadings >= this.o.batchMaxReadings || epoch !== this.epoch) void this.flush();
        else if (!this.timer)
          this.timer = setTimeout(() => {
            this.timer = null;
            void this.flush();
          }, this.o.batchMaxWaitMs);
      }
    }
  }

  /** Parses a batch of messages and stores everything it holds in one transaction (then status and replies). */
  private async process(batch: Pending[]): Promise<Omit<CommittedInfo, 'ms' | 'messages' | 'topics' | 'payloads'>> {
    const items: IngestItem[] = [];
    const dead: DeadLetterInput[] = [];
    const statuses: { tank: IngestTank; online: boolean; at: Date }[] = [];
    const replies: { tank: IngestTank; payload: Buffer; topic: string; at: Date }[] = [];
    const now = Date.now();

    for (const { msg, receivedAt } of batch) {
      const t = parseTopic(msg.topic);
      const tank = t ? await this.directory.bySerialCached(t.serial) : null;
      if (!t || !tank) {
        dead.push({
          tankId: null,
          serial: t?.serial ?? null,
          transport: 'mqtt',
          topic: msg.topic,
          reasonCode: 'UnknownTank',
          reason: t ? `No tank with serial ${t.serial} is registered.` : 'The topic is not a Heatlayer tank topic.',
          fields: [],
          payload: msg.payload,
        });
        continue;
      }
      if (t.channel === 'status') {
        const s = msg.payload.toString('utf8').trim();
        if (s === 'online' || s === 'offline')
          statuses.push({ tank, online: s === 'online', at: new Date(receivedAt) });
        else
          dead.push(
            deadLetter(tank, msg, 'InvalidStatus', 'A status must be "online" or "offline".', [
              { field: '(body)', message: 'must be online or offline.' },
            ]),
          );
        continue;
      }
      if (t.channel === 'replies') {
        replies.push({ tank, payload: msg.payload, topic: msg.topic, at: new Date(receivedAt) });
        continue;
      }
      if (t.channel !== 'telemetry') continue;
      const parsed = parseTelemetry(msg.payload, {
        now,
        tank: { serial: tank.serial, sensorCount: tank.sensorCount },
        retentionDays: this.o.retentionDays,
      });
      if (!parsed.ok) {
        dead.push(deadLetter(tank, msg, parsed.code, parsed.reason, parsed.fields));
        continue;
      }
      for (const reading of parsed.readings) items.push({ tank, reading });
      for (const r of parsed.rejected) dead.push(rejectedLetter(tank, msg, r, parsed.batch));
    }

    const replyUpdates: { tank: IngestTank; reply: ReturnType<typeof commandReplySchema.parse>; at: Date }[] = [];
    for (const r of replies) {
      let body: unknown;
      try {
        body = JSON.parse(r.payload.toString('utf8'));
      } catch {
        dead.push({
          tankId: r.tank.id,
          serial: r.tank.serial,
          transport: 'mqtt',
          topic: r.topic,
          reasonCode: 'InvalidJson',
          reason: 'The command reply is not valid JSON.',
          fields: [{ field: '(body)', message: 'must be valid JSON.' }],
          payload: r.payload,
        });
        continue;
      }
      const parsed = commandReplySchema.safeParse(body);
      if (!parsed.success) {
        dead.push({
          tankId: r.tank.id,
          serial: r.tank.serial,
          transport: 'mqtt',
          topic: r.topic,
          reasonCode: 'InvalidReply',
          reason: 'The command reply has invalid fields.',
          fields: zodFieldErrors(parsed.error),
          payload: r.payload,
        });
        continue;
      }
      replyUpdates.push({ tank: r.tank, reply: parsed.data, at: r.at });
    }

    // Status and replies are idempotent (a replayed reply cannot move a command backwards), so they
    // go first: if the batch write then fails, the retry repeats them harmlessly, while the readings
    // and dead letters commit exactly once, together.
    for (const s of statuses) await recordTankStatus(s.tank.id, s.online, s.at);
    for (const r of replyUpdates) {
      const row = await recordCommandReply(r.tank.id, r.reply, r.at);
      if (row?.state === 'applied' && row.kind === 'set_target') {
        this.directory.update(r.tank.serial, { targetC: (row.params as { targetC: number }).targetC });
      }
    }
    const result = await this.writer.write({ readings: items, deadLetters: dead });
    this.stats.inserted += result.inserted;
    this.stats.duplicates += result.duplicates;
    this.stats.deadLetters += dead.length;
    return {
      readings: items.length,
      inserted: result.inserted,
      duplicates: result.duplicates,
      deadLetters: dead.length,
    };
  }
}

/** A batch message counts for what it holds (about 180 bytes a reading); its exact count is known only once parsed. */
const estimatedReadings = (msg: InboundMessage) =>
  msg.payload.length > 4096 ? Math.ceil(msg.payload.length / 180) : 1;

function deadLetter(
  tank: IngestTank,
  msg: InboundMessage,
  reasonCode: string,
  reason: string,
  fields: { field: string; message: string }[],
): DeadLetterInput {
  return {
    tankId: tank.id,
    serial: tank.serial,
    transport: 'mqtt',
    topic: msg.topic,
    reasonCode,
    reason,
    fields,
    payload: msg.payload,
  };
}

function rejectedLetter(tank: IngestTank, msg: InboundMessage, r: RejectedReading, batch: boolean): DeadLetterInput {
  // From a batch, keep just the rejected reading (the rest was stored).
  const letter = deadLetter(tank, msg, r.code, batch ? `readings[${r.index}]: ${r.reason}` : r.reason, r.fields);
  return batch ? { ...letter, payload: Buffer.from(JSON.stringify(r.raw) ?? 'null') } : letter;
}
