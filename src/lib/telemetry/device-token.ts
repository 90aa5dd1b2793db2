// Device credentials: a tank authenticates with its serial and a secret token.
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

/** Tokens carry a prefix so that secret scanners and people recognise them. */
const PREFIX = 'hldt_';

/** A new random device token: 256 bits from the OS CSPRNG. Shown once; only its hash is stored. */
export function generateDeviceToken(): string {
  return PREFIX + randomBytes(32).toString('base64url');
}

/**
 * The stored form of a token. Plain SHA-256 is the right tool here, unlike for passwords: the
 * token is 256 random bits, so there is nothing to guess and a slow hash adds no protection,
 * while a fast one lets the broker authenticate a whole fleet reconnecting at once (argon2id at
 * ~20 ms a check would hold 10,000 tanks back for minutes).
 */
export function hashDeviceToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** Constant-time comparison of a presented token with a stored hash. */
export function tokenMatches(token: string, storedHash: string | null | undefined): boolean {
  if (!storedHash) return false;
  const a = Buffer.from(hashDeviceToken(token), 'hex');
  const b = Buffer.from(storedHash, 'hex');
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * The demo fleet's tokens: HMAC-SHA256(key, serial), so that the seed and the simulator agree
 * without the simulator reading the database. Demo only; real tanks get generateDeviceToken().
 */
export function demoDeviceToken(key: string, serial: string): string {
  return PREFIX + createHmac('sha256', key).update(serial, 'utf8').digest('base64url');
}

/**
 * The MQTT username of Heatlayer's own processes (ingest worker, web). The leading underscore
 * keeps it out of the serial pattern (no tank can be called this) and is valid in a Mosquitto
 * password file (a colon would not be).
 */
export const SERVICE_USERNAME = '_heatlayer-service';

/** Password of the service account, derived from AUTH_SECRET unless MQTT_SERVICE_PASSWORD is set. */
export function servicePassword(env: { AUTH_SECRET?: string; MQTT_SERVICE_PASSWORD?: string }): string {
  if (env.MQTT_SERVICE_PASSWORD) return env.MQTT_SERVICE_PASSWORD;
  if (!env.AUTH_SECRET)
    throw new Error(
      'Neither MQTT_SERVICE_PASSWORD nor AUTH_SECRET is set: the broker service account has no password. Start the product with `npm start`, or set one of them.',
    );
  return createHmac('sha256', env.AUTH_SECRET).update('heatlayer mqtt service account').digest('base64url');
}
