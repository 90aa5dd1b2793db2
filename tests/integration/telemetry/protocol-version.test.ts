// The wire contract names the MQTT versions a tank may use; the broker `npm test` starts must take
// exactly those. Protocol levels: 4 = MQTT 3.1.1 (OASIS MQTT 3.1.1 §3.1.2.2), 5 = MQTT 5.0 (OASIS
// MQTT 5.0 §3.1.2.2).
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { connectDevice, mqttUrl, tankWithToken, testPg, type TestTank } from './helpers';

const levels = { '3.1.1': 4, '5': 5 } as const;
type Version = keyof typeof levels;

/** The versions in the contract's MQTT heading, e.g. "## MQTT 3.1.1 (QoS 1)" or "## MQTT (3.1.1 or 5, QoS 1)". */
function documentedVersions(): Version[] {
  const doc = readFileSync(new URL('../../../docs/wire-contract.md', import.meta.url), 'utf8');
  const heading = doc.match(/^## MQTT\b(.*)$/m);
  if (!heading) throw new Error('docs/wire-contract.md has no "## MQTT" heading.');
  const found = [...heading[1].matchAll(/\b(3\.1\.1|5(?:\.0)?)\b/g)].map(
    (m) => (m[1].startsWith('5') ? '5' : '3.1.1') as Version,
  );
  return [...new Set(found)];
}

describe('MQTT protocol versions', () => {
  let db: pg.Pool;
  let tank: TestTank;

  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 217);
  });
  afterAll(async () => {
    await db?.end();
  });

  it('the contract names at least one version', () => {
    expect(documentedVersions().length).toBeGreaterThan(0);
  });

  for (const version of Object.keys(levels) as Version[]) {
    it(`the broker takes MQTT ${version} exactly when the contract names it`, async () => {
      const documented = documentedVersions().includes(version);
      const accepted = await connectDevice(mqttUrl(), tank, { protocolVersion: levels[version] }).then(
        async (c) => {
          await c.endAsync();
          return true;
        },
        () => false,
      );
      expect({ version, accepted }).toEqual({ version, accepted: documented });
    });
  }
});
