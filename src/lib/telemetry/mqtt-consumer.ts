// A minimal MQTT 3.1.1 subscriber that acknowledges each QoS 1 message when its caller says so.
//
// Why not mqtt.js here: mqtt.js handles incoming packets strictly one after another and sends a
// message's PUBACK before it looks at the next packet (its customHandleAcks hook exists for MQTT 5
// only, and delaying it stalls the whole connection), so "acknowledge after the batch is committed"
// would mean one message a batch. This session speaks plain MQTT 3.1.1 through mqtt-packet (the
// codec mqtt.js and aedes use), keeps many messages in flight, and acknowledges them in any order.
// It works against any standard broker (aedes, Mosquitto). Devices and the web use mqtt.js.
import { connect as netConnect, type Socket } from 'node:net';
import mqttPacket, { type IPublishPacket, type Packet } from 'mqtt-packet';

export interface InboundMessage {
  topic: string;
  payload: Buffer;
  qos: 0 | 1;
  retain: boolean;
  /** Sends the PUBACK (QoS 1) if the connection it came on is still up; otherwise the broker redelivers it. */
  ack(): void;
}

export interface ConsumerOptions {
  url: string;
  clientId: string;
  username: string;
  password: string;
  /** Topic filters, each subscribed with QoS 1. */
  filters: readonly string[];
  /** Seconds (MQTT keepalive). */
  keepaliveS?: number;
  will?: { topic: string; payload: string; retain: boolean };
  onMessage(msg: InboundMessage): void;
  /** Called after every successful (re)connection and subscription. */
  onReady?(info: { sessionPresent: boolean }): void;
  /** Called when a connection is lost; unacknowledged messages of it will be redelivered. */
  onDisconnect?(reason: string): void;
  log?(line: string): void;
}

export class MqttConsumer {
  private socket: Socket | null = null;
  private generation = 0;
  private stopped = false;
  private paused = false;
  private backoffMs = 250;
  private keepTimer: NodeJS.Timeout | null = null;
  private reconnectTimer: NodeJS.Timeout | null = null;
  private lastSent = 0;
  private lastHeard = 0;
  private nextId = 1;
  private ready = false;

  constructor(private readonly opts: ConsumerOptions) {}

  get connected(): boolean {
    return this.ready;
  }

  start(): void {
    this.stopped = false;
    this.open();
  }

  /** Closes the connection (DISCONNECT, so the will is not sent) and stops reconnecting. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    const s = this.socket;
    if (!s) return;
    await new Promise<void>((resolve) => {
      s.once('close', () => resolve());
      if (this.ready) s.end(mqttPacket.generate({ cmd: 'disconnect' }));
      else s.destroy();
      setTimeout(() => {
        s.destroy();
        resolve();
      }, 2000).unref();
    });
  }

  /** Stops reading (TCP backpressure reaches the broker) until resume(). */
  pause(): void {
    this.paused = true;
    this.socket?.pause();
  }

  resume(): void {
    this.paused = false;
    this.socket?.resume();
  }

  /** Drops the current connection; unacknowledged messages come back on the next one. */
  reconnect(reason: string): void {
    this.socket?.destroy(new Error(reason));
  }

  /** Publishes QoS 0 (service status). */
  publish(topic: string, payload: string, retain = false): void {
    if (!this.ready || !this.socket) return;
    this.write({ cmd: 'publish', topic, payload: Buffer.from(payload), qos: 0, retain, dup: false });
  }

  private write(p: Packet): void {
    if (!this.socket || this.socket.destroyed) return;
    this.socket.write(mqttPacket.generate(p));
    this.lastSent = Date.now();
  }

  private open(): void {
    const url = new URL(this.opts.url);
    const gen = ++this.generation;
    const socket = netConnect({ host: url.hostname, port: Number(url.port || 1883) });
    this.socket = socket;
    socket.setNoDelay(true);
    const parser = mqttPacket.parser({ protocolVersion: 4 });
    const keepaliveS = this.opts.keepaliveS ?? 30;
    let closedReason = 'connection closed';

    socket.on('connect', () => {
      this.lastHeard = Date.now();
      this.write({
        cmd: 'connect',
        protocolId: 'MQTT',
        protocolVersion: 4,
        clean: false,
        clientId: this.opts.clientId,
        keepalive: keepaliveS,
        username: this.opts.username,
        password: Buffer.from(this.opts.password),
        ...(this.opts.will
          ? {
              will: {
                topic: this.opts.will.topic,
                payload: Buffer.from(this.opts.will.payload),
                qos: 1,
                retain: this.opts.will.retain,
              },
            }
          : {}),
      });
      if (this.paused) socket.pause();
    });
    socket.on('data', (buf) => {
      this.lastHeard = Date.now();
      parser.parse(buf);
    });
    parser.on('error', (err) => {
      closedReason = `protocol error: ${err.message}`;
      socket.destroy();
    });
    parser.on('packet', (p: Packet) => {
      if (gen !== this.generation) return;
      switch (p.cmd) {
        case 'connack': {
          const code = (p as { returnCode?: number }).returnCode ?? 0;
          if (code !== 0) {
            closedReason = `broker refused the connection (CONNACK return code ${code})`;
            socket.destroy();
            return;
          }
          this.backoffMs = 250;
          this.write({
            cmd: 'subscribe',
            messageId: this.id(),
            subscriptions: this.opts.filters.map((topic) => ({ topic, qos: 1 as const })),
          });
          this.sessionPresent = Boolean((p as { sessionPresent?: boolean }).sessionPresent);
          return;
        }
        case 'suback': {
          const granted = (p as { granted: number[] }).granted;
          if (granted.some((g) => g === 128)) {
            closedReason = `broker refused a subscription (${this.opts.filters.join(', ')})`;
            this.stopped = true; // a permission problem: retrying will not help
            socket.destroy();
            return;
          }
          this.ready = true;
          this.opts.onReady?.({ sessionPresent: this.sessionPresent });
          return;
        }
        case 'publish': {
          const pub = p as IPublishPacket;
          const payload = Buffer.isBuffer(pub.payload) ? pub.payload : Buffer.from(pub.payload);
          const messageId = pub.messageId;
          const qos = pub.qos === 0 ? 0 : 1;
          let acked = false;
          const ack = () => {
            if (acked || qos === 0 || gen !== this.generation) return;
            acked = true;
            this.write({ cmd: 'puback', messageId: messageId! });
          };
          if (pub.qos === 2) this.write({ cmd: 'pubrec', messageId: messageId! }); // never subscribed at QoS 2; answer correctly anyway
          this.opts.onMessage({ topic: pub.topic, payload, qos, retain: pub.retain, ack });
          return;
        }
        case 'pubrel':
          this.write({ cmd: 'pubcomp', messageId: (p as { messageId: number }).messageId });
          return;
        default:
          return; // pingresp, unsuback: nothing to do
      }
    });

    this.keepTimer = setInterval(() => {
      const now = Date.now();
      if (now - this.lastSent >= (keepaliveS * 1000) / 2) this.write({ cmd: 'pingreq' });
      // While paused we do not read, so silence is expected; the broker's own keepalive still holds.
      if (!this.paused && now - this.lastHeard > keepaliveS * 1500) {
        closedReason = 'keepalive timeout';
        socket.destroy();
      }
    }, 1000);
    this.keepTimer.unref();

    socket.on('error', (err) => {
      closedReason = err.message;
    });
    socket.on('close', () => {
      if (this.keepTimer) clearInterval(this.keepTimer);
      if (gen !== this.generation) return;
      this.generation++; // acks of this connection's messages are now void
      const wasReady = this.ready;
      this.ready = false;
      this.socket = null;
      this.opts.onDisconnect?.(closedReason);
      if (this.stopped) return;
      if (wasReady) this.opts.log?.(`[mqtt] connection lost (${closedReason}); reconnecting`);
      else
        this.opts.log?.(
          `[mqtt] could not connect to ${this.opts.url} (${closedReason}); retrying in ${this.backoffMs} ms`,
        );
      this.reconnectTimer = setTimeout(() => this.open(), this.backoffMs);
      this.backoffMs = Math.min(this.backoffMs * 2, 5000);
    });
  }

  private sessionPresent = false;

  private id(): number {
    this.nextId = (this.nextId % 65535) + 1;
    return this.nextId;
  }
}
