// Ports and settings for one running copy of the product: `npm start` uses the defaults (or the
// environment), `npm test` a block of ports of its own so that both can run at once.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { testPortBase } from './ports';

export interface RunConfig {
  host: string;
  webPort: number;
  pgPort: number;
  mqttPort: number;
  /** The ingest tier's HTTP listener for gateways (`POST /api/ingest`). */
  ingestPort: number;
  smtpPort: number;
  /** The fake S3 server (s3rver) for uploads and documents, when S3_ENDPOINT names no real one. */
  s3Port: number;
  /** Where this copy keeps generated secrets and captured mail. */
  dataDir: string;
  authSecret: string;
  demoPassword: string;
  simulatorTanks: number;
  /** Key of the demo fleet's device tokens (HMAC of each serial), shared by the seed and the simulator. */
  deviceTokenSeed: string;
}

const root = new URL('../..', import.meta.url).pathname;
const num = (v: string | undefined, d: number) => (v && Number.isFinite(Number(v)) ? Number(v) : d);

/** AUTH_SECRET from the environment, or one generated on first start and kept under .data/. */
function authSecret(dataDir: string): string {
  return keptSecret(dataDir, 'auth-secret', process.env.AUTH_SECRET);
}

/** DEVICE_TOKEN_SEED from the environment, or one generated on first start and kept as .data/device-seed. */
function deviceTokenSeed(dataDir: string): string {
  return keptSecret(dataDir, 'device-seed', process.env.DEVICE_TOKEN_SEED);
}

function keptSecret(dataDir: string, name: string, fromEnv: string | undefined): string {
  if (fromEnv) return fromEnv;
  const file = join(dataDir, name);
  if (!existsSync(file)) {
    mkdirSync(dataDir, { recursive: true });
    writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
  }
  return readFileSync(file, 'utf8').trim();
}

export function startConfig(): RunConfig {
  const dataDir = join(root, '.data');
  return {
    host: process.env.HOST ?? '127.0.0.1',
    webPort: num(process.env.PORT, 4321),
    pgPort: num(process.env.PG_PORT, 54329),
    mqttPort: num(process.env.MQTT_PORT, 18830),
    ingestPort: num(process.env.INGEST_PORT, 4322),
    smtpPort: num(process.env.SMTP_PORT, 2525),
    s3Port: num(process.env.S3_PORT, 4569),
    dataDir,
    authSecret: authSecret(dataDir),
    demoPassword: process.env.DEMO_PASSWORD ?? 'heatlayer-demo',
    simulatorTanks: num(process.env.SIMULATOR_TANKS, 240),
    deviceTokenSeed: deviceTokenSeed(dataDir),
  };
}

/** Test ports: a block starting at HEATLAYER_TEST_PORT_BASE (default 25400, below the ephemeral range; ./ports.ts). */
export function testConfig(): RunConfig {
  const base = testPortBase();
  const dataDir = join(root, '.data', `test-${base}`);
  return {
    host: '127.0.0.1',
    pgPort: base,
    webPort: base + 1,
    mqttPort: base + 2,
    smtpPort: base + 3,
    ingestPort: base + 4,
    s3Port: base + 5,
    dataDir,
    authSecret: randomBytes(32).toString('base64url'),
    demoPassword: 'heatlayer-demo',
    simulatorTanks: 0,
    deviceTokenSeed: randomBytes(32).toString('base64url'),
  };
}

/** The environment every process of this copy gets. */
export function processEnv(
  c: RunConfig,
  pgUrl: string,
  mode: 'development' | 'production' | 'test',
): Record<string, string> {
  return {
    NODE_ENV: mode,
    HOST: c.host,
    PORT: String(c.webPort),
    PG_PORT: String(c.pgPort),
    DATABASE_URL: pgUrl,
    MQTT_PORT: String(c.mqttPort),
    INGEST_PORT: String(c.ingestPort),
    SMTP_PORT: String(c.smtpPort),
    S3_PORT: String(c.s3Port),
    AUTH_SECRET: c.authSecret,
    AUTH_URL: process.env.AUTH_URL ?? `http://localhost:${c.webPort}`,
    AUTH_TRUST_HOST: 'true',
    DEMO_PASSWORD: c.demoPassword,
    SIMULATOR_TANKS: String(c.simulatorTanks),
    HEATLAYER_DATA_DIR: c.dataDir,
    DEVICE_TOKEN_SEED: c.deviceTokenSeed,
    // The pinned AWS SDK supports Node 20; at start it warns that its releases after January 2027
    // will need Node 22. Its documented switch (aws/aws-sdk-js-v3 issue #7983) keeps that notice out
    // of every log line of ours; moving to Node 22 is in the README.
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
  };
}
