import { describe, expect, it } from 'vitest';
import { clientIdAllowed, mayPublish, maySubscribe } from '../../../src/lib/telemetry/acl';
import {
  SERVICE_USERNAME,
  demoDeviceToken,
  generateDeviceToken,
  hashDeviceToken,
  tokenMatches,
} from '../../../src/lib/telemetry/device-token';
import { SERIAL_PATTERN, topicFor } from '../../../src/lib/telemetry/wire';

const dev = { kind: 'device' as const, serial: 'KVC210-100001' };

describe('broker authorisation', () => {
  it('lets a tank publish only its own telemetry, status and replies, and read only its own commands', () => {
    expect(mayPublish(dev, topicFor(dev.serial, 'telemetry'))).toBe(true);
    expect(mayPublish(dev, topicFor(dev.serial, 'status'))).toBe(true);
    expect(mayPublish(dev, topicFor(dev.serial, 'replies'))).toBe(true);
    expect(mayPublish(dev, topicFor(dev.serial, 'commands'))).toBe(false);
    expect(mayPublish(dev, topicFor('KVC210-100002', 'telemetry'))).toBe(false);
    expect(maySubscribe(dev, topicFor(dev.serial, 'commands'))).toBe(true);
    expect(maySubscribe(dev, 'heatlayer/v1/tanks/+/commands')).toBe(false);
    expect(maySubscribe(dev, 'heatlayer/v1/#')).toBe(false);
  });

  it("keeps a tank from taking another client's session id", () => {
    expect(clientIdAllowed(dev, dev.serial)).toBe(true);
    expect(clientIdAllowed(dev, `${dev.serial}-gw`)).toBe(true);
    expect(clientIdAllowed(dev, 'heatlayer-ingest')).toBe(false);
  });

  it('uses a service username no serial can have', () => {
    expect(SERIAL_PATTERN.test(SERVICE_USERNAME)).toBe(false);
  });
});

describe('device tokens', () => {
  it('are 256-bit random, stored as SHA-256, compared in constant time', () => {
    const a = generateDeviceToken();
    expect(a).not.toBe(generateDeviceToken());
    // SHA-256 digest is 32 bytes, 64 hex characters (FIPS 180-4).
    expect(hashDeviceToken(a)).toMatch(/^[0-9a-f]{64}$/);
    expect(tokenMatches(a, hashDeviceToken(a))).toBe(true);
    expect(tokenMatches(a, hashDeviceToken(`${a}x`))).toBe(false);
    expect(tokenMatches(a, null)).toBe(false);
  });

  it("derive the demo fleet's tokens from the key and the serial alone", () => {
    expect(demoDeviceToken('k1', 'S1')).toBe(demoDeviceToken('k1', 'S1'));
    expect(demoDeviceToken('k1', 'S1')).not.toBe(demoDeviceToken('k2', 'S1'));
    expect(demoDeviceToken('k1', 'S1')).not.toBe(demoDeviceToken('k1', 'S2'));
  });
});
