// The MQTT broker (aedes) on loopback, with Heatlayer's authentication and authorisation: every
// client logs in (a tank: username = serial, password = its device token; Heatlayer's own
// processes: the service account), a tank publishes only to its own telemetry, status and replies
// topics and subscribes only to its own command topic. A packet larger than the contract's
// `limits.maxPacketBytes` closes its connection unacknowledged, and a tank has one live connection:
// a new login with its credentials takes over from the old one (see `takeOver`).
import { createServer, type Server } from 'node:net';
import { Aedes, type AuthenticateError, type Client } from 'aedes';
import { clientIdAllowed, looksLikeSerial, mayPublish, maySubscribe, type Principal } from './acl';
import { SERVICE_USERNAME, tokenMatches } from './device-token';
import { PacketSizeGuard } from './packet-size';
import { CREDENTIALS_ROTATED_TOPIC, INGEST_CLIENT_ID, ingestFilters, limits, parseTopic } from './wire';

export interface BrokerOptions {
  host?: string;
  port: number;
  servicePassword: string;
  /** The stored token hash of a serial (null when unknown); throws when the database is unreachable. */
  lookupTokenHash(serial: string): Promise<string | null>;
  /** Messages processed in parallel. aedes' default (100) makes a reconnecting fleet drain slowly. */
  concurrency?: number;
  /** How long a subscriber's full socket is tolerated before it is cut off. */
  drainTimeoutMs?: number;
  /** Largest MQTT packet taken, headers included (default: the contract's). */
  maxPacketBytes?: number;
  log?: (line: string) => void;
}

export interface TelemetryBroker {
  aedes: Aedes;
  server: Server;
  port: number;
  /**
   * Stops taking connections, disconnects the tanks (they keep what was not acknowledged and send
   * it again to the next broker), waits until the ingest worker has acknowledged everything queued
   * for it (at most `drainMs`), then closes.
   */
  close(opts?: { drainMs?: number; drainClientIds?: string[] }): Promise<{ undelivered: number }>;
}

const principals = new WeakMap<Client, Principal>();

function authError(message: string, returnCode: 3 | 4 | 5): AuthenticateError {
  return Object.assign(new Error(message), { returnCode }) as AuthenticateError;
}

export async function startBroker(opts: BrokerOptions): Promise<TelemetryBroker> {
  const log = opts.log ?? ((line: string) => console.log(line));
  // This broker keeps sessions in memory: a fresh one knows no subscriber, and a reading published
  // before the ingest worker subscribes would reach no one. So tanks are admitted only once an
  // ingest session exists (it then lives on, queuing for the worker, while the worker reconnects).
  let ingestSubscribed = false;
  const aedes = await Aedes.createBroker({
    concurrency: opts.concurrency ?? 2000,
    // A subscriber whose socket stays full this long is cut off (its session is kept). Long enough
    // for the ingest worker, which stops reading on purpose while PostgreSQL is away: cutting it
    // off would move the backlog into broker memory without any backpressure on the tanks.
    drainTimeout: opts.drainTimeoutMs ?? 120_000,
    // Client ids: serial plus a suffix.
    maxClientsIdLength: 128,
    authenticate(client, username, password, done) {
      void (async () => {
        const pass = password?.toString('utf8') ?? '';
        if (username === SERVICE_USERNAME) {
          if (pass !== opts.servicePassword) return done(authError('Bad service credentials.', 4), false);
          const p: Principal = { kind: 'service' };
          if (!clientIdAllowed(p, client.id))
            return done(authError('Service client ids start with heatlayer-.', 5), false);
          principals.set(client, p);
          return done(null, true);
        }
        if (!username || !looksLikeSerial(username))
          return done(authError('The username must be the tank serial.', 4), false);
        let hash: string | null;
        try {
          hash = await opts.lookupTokenHash(username);
        } catch (err) {
          log(`[broker] cannot check credentials of ${username}: ${err instanceof Error ? err.message : String(err)}`);
          return done(authError('Credentials cannot be checked right now.', 3), false);
        }
        if (!tokenMatches(pass, hash)) return done(authError('Bad serial or device token.', 4), false);
        if (!ingestSubscribed)
          return done(authError('The ingest side is not subscribed yet; try again shortly.', 3), false);
        const p: Principal = { kind: 'device', serial: username };
        if (!clientIdAllowed(p, client.id))
          return done(
            authError(`The client id must be the serial (${username}) or start with "${username}-".`, 5),
            false,
          );
        principals.set(client, p);
        await takeOver(client, username);
        done(null, true);
      })();
    },
    authorizePublish(client, packet, done) {
      const p = client ? principals.get(client) : undefined;
      if (!p || !mayPublish(p, packet.topic)) {
        log(`[broker] refused: ${client?.id ?? '?'} may not publish to ${packet.topic}`);
        return done(new Error(`Not allowed to publish to ${packet.topic}.`));
      }
      // A retained reading would be replayed to every new subscriber; only status is retained.
      if (p.kind === 'device' && parseTopic(packet.topic)?.channel !== 'status') packet.retain = false;
      done(null);
    },
    authorizeSubscribe(client, sub, done) {
      const p = client ? principals.get(client) : undefined;
      if (!p || !maySubscribe(p, sub.topic)) {
        log(`[broker] refused: ${client?.id ?? '?'} may not subscribe to ${sub.topic}`);
        return done(null, null); // SUBACK failure code for this filter
      }
      if (p.kind === 'service' && sub.topic === ingestFilters.telemetry && sub.qos > 0 && !client!.clean)
        ingestSubscribed = true;
      done(null, sub);
    },
  });

  // Public at run time, missing from aedes' type definitions.
  const internals = aedes as unknown as {
    clients: Record<string, Client>;
    persistence: {
      outgoingStream(c: { id: string }): AsyncIterable<unknown>;
      cleanSubscriptions(c: { id: string }): Promise<void>;
    };
  };

  /**
   * One live connection per tank. A tank logging in again (a rebooted controller whose old TCP
   * connection has not timed out yet, or one that changed its client id) takes over: the tank's
   * other connections are closed first. With the same client id aedes does this itself (MQTT
   * 3.1.1 §3.1.4) and keeps the session; a different client id's session is also forgotten, so
   * commands stop queueing for a client that is gone. Refusing the newcomer instead would lock a
   * rebooted tank out until its old connection's keep-alive ran out.
   */
  async function takeOver(newcomer: Client, serial: string): Promise<void> {
    const others = Object.values(internals.clients).filter(
      (c) =>
        c !== newcomer &&
        c.id !== newcomer.id &&
        principals.get(c)?.kind === 'device' &&
        (principals.get(c) as { serial: string }).serial === serial,
    );
    for (const old of others) {
      log(`[broker] ${serial} logged in again as ${newcomer.id}; closing its connection as ${old.id}`);
      await new Promise<void>((resolve) => old.close(() => resolve()));
      await internals.persistence.cleanSubscriptions({ id: old.id });
    }
  }

  // Token rotation: end the sessions that logged in with the old token.
  aedes.subscribe(
    CREDENTIALS_ROTATED_TOPIC,
    (packet, cb) => {
      const serial = packet.payload.toString('utf8');
      for (const c of Object.values(internals.clients)) {
        const p = principals.get(c);
        if (p?.kind === 'device' && p.serial === serial) c.close();
      }
      cb();
    },
    () => undefined,
  );

  const maxPacketBytes = opts.maxPacketBytes ?? limits.maxPacketBytes;
  const server = createServer((socket) => {
    aedes.handle(socket);
    // aedes reads the socket with read() on 'readable'; a 'data' listener added beside it sees
    // each chunk as aedes reads it and does not change that (Node's stream docs: 'readable' takes
    // precedence). The oversize packet is cut off at its header, before its body is buffered.
    const guard = new PacketSizeGuard(maxPacketBytes);
    socket.on('data', (chunk: Buffer) => {
      const size = guard.push(chunk);
      if (size === null) return;
      log(
        `[broker] closed ${socket.remoteAddress ?? '?'}:${socket.remotePort ?? '?'}: a packet of ${size} bytes (at most ${maxPacketBytes})`,
      );
      socket.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
  });
  const port = (server.address() as { port: number }).port;

  async function undelivered(clientIds: string[]): Promise<number> {
    let n = 0;
    for (const id of clientIds) for await (const _ of internals.persistence.outgoingStream({ id })) n++;
    return n;
  }

  return {
    aedes,
    server,
    port,
    async close({ drainMs = 10_000, drainClientIds = [INGEST_CLIENT_ID] } = {}) {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      for (const c of Object.values(internals.clients)) if (principals.get(c)?.kind === 'device') c.close();
      const until = Date.now() + drainMs;
      let left = await undelivered(drainClientIds);
      while (left > 0 && Date.now() < until) {
        await new Promise((r) => setTimeout(r, 50));
        left = await undelivered(drainClientIds);
      }
      if (left > 0)
        log(
          `[broker] closing with ${left} messages the ingest worker has not acknowledged (they are lost with this in-memory broker)`,
        );
      await new Promise<void>((resolve) => aedes.close(() => resolve()));
      await closed;
      return { undelivered: left };
    },
  };
}
