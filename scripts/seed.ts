// Seeds the invented demo scenario into an empty database (does nothing if companies exist).
import { sql } from 'drizzle-orm';
import { closeDb, db } from '../src/db';
import { companies, homeMembers, homes, memberships, serviceVisits, tanks, tariffs, users } from '../src/db/schema';
import { parseTariff, type Tariff } from '../src/lib/energy';
import { demoAccounts, demoCompanies, demoTanks } from '../src/lib/demo/scenario';
import { env } from '../src/lib/server/env';
import { hashPassword } from '../src/lib/server/password';
import { demoDeviceToken, hashDeviceToken } from '../src/lib/telemetry/device-token';

/** The demo fleet's device-token key (the simulator derives the same tokens from it). */
function demoTokenHash(serial: string): string | null {
  const key = env().DEVICE_TOKEN_SEED;
  return key ? hashDeviceToken(demoDeviceToken(key, serial)) : null;
}

/** Gives demo tanks that have no device token yet their derived one (databases seeded earlier). */
async function provisionDemoDeviceTokens(): Promise<void> {
  if (!env().DEVICE_TOKEN_SEED) return;
  const rows = demoTanks().map((t) => ({ serial: t.serial, hash: demoTokenHash(t.serial) }));
  await db().execute(sql`
    update tanks t set device_token_hash = x.hash
    from json_to_recordset(${JSON.stringify(rows)}::json) as x(serial text, hash text)
    where t.serial = x.serial and t.device_token_hash is null`);
}

/**
 * Kestrel Vale's default tariffs: flat until April 2026, then day/night. The prices are invented for
 * the demo (not any supplier's), and go through the same validation as the tariff form.
 */
function demoDefaultTariffs(): Tariff[] {
  const inputs = [
    { kind: 'flat', name: 'Wendmoor Standard (demo)', unit: 'p/kWh', import: 24.5, export: 15, validFrom: '2025-01-01T00:00:00Z', validTo: '2026-04-01T00:00:00Z' },
    { kind: 'day_night', name: 'Wendmoor Night Saver (demo)', unit: 'p/kWh', timeZone: 'Europe/London', nightStart: '00:30', nightEnd: '05:30', dayImport: 27, nightImport: 8.5, export: 15, validFrom: '2026-04-01T00:00:00Z' },
  ];
  return inputs.map((i) => {
    const r = parseTariff(i);
    if (!r.ok) throw new Error(`Demo tariff ${i.name} is invalid: ${r.errors.map((e) => e.message).join(' ')}`);
    return r.tariff;
  });
}

export async function seedIfEmpty(): Promise<boolean> {
  const d = db();
  const [{ n }] = await d.select({ n: sql<number>`count(*)::int` }).from(companies);
  if (n > 0) {
    await provisionDemoDeviceTokens();
    return false;
  }
  await d.transaction(async (tx) => {
    const companyIds = new Map<string, string>();
    for (const c of demoCompanies) {
      const [row] = await tx.insert(companies).values({ slug: c.slug, name: c.name, emailDomain: c.emailDomain }).returning();
      companyIds.set(c.slug, row.id);
    }
    for (const t of demoDefaultTariffs()) {
      await tx.insert(tariffs).values({ companyId: companyIds.get('kestrel-vale')!, homeId: null, kind: t.kind, name: t.name ?? null, validFrom: new Date(t.validFromMs), validTo: t.validToMs === null ? null : new Date(t.validToMs), prices: t });
    }
    const firstHome = new Map<string, string>();
    for (const t of demoTanks()) {
      const companyId = companyIds.get(t.companySlug)!;
      const [home] = await tx.insert(homes).values({
        companyId, reference: t.homeRef, addressLine: t.addressLine, town: t.town, postcode: t.postcode,
        occupants: t.occupants, hasSolar: t.hasSolar, contactName: t.contactName,
      }).returning({ id: homes.id });
      if (!firstHome.has(t.companySlug)) firstHome.set(t.companySlug, home.id);
      const [tank] = await tx.insert(tanks).values({
        companyId, homeId: home.id, serial: t.serial, model: t.model, volumeL: t.volumeL, heightM: t.heightM,
        sensorCount: t.sensorCount, heatSource: t.heatSource, hpOutputW: t.hpOutputW, immersionW: t.immersionW,
        declaredLossW: t.declaredLossW, targetC: t.targetC, hysteresisK: t.hysteresisK, commissionedAt: new Date(Date.now() - t.commissionedDaysAgo * 86_400_000),
        deviceTokenHash: demoTokenHash(t.serial),
      }).returning({ id: tanks.id });
      if (t.inspectionsDaysAgo.length > 0) {
        await tx.insert(serviceVisits).values(t.inspectionsDaysAgo.map((d) => ({
          companyId, tankId: tank.id, kind: 'annual_inspection' as const, visitedAt: new Date(Date.now() - d * 86_400_000),
          findings: 'Annual inspection (demo record): relief valves operated, expansion provision checked, no faults found.',
        })));
      }
    }
    const passwordHash = await hashPassword(env().DEMO_PASSWORD);
    for (const a of demoAccounts()) {
      const [u] = await tx.insert(users).values({ email: a.email, name: a.name, passwordHash, emailVerified: new Date() }).returning({ id: users.id });
      await tx.insert(memberships).values({ userId: u.id, companyId: companyIds.get(a.companySlug)!, role: a.role });
      if (a.role === 'householder') await tx.insert(homeMembers).values({ homeId: firstHome.get(a.companySlug)!, userId: u.id });
    }
  });
  return true;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  seedIfEmpty()
    .then((did) => console.log(did ? '[seed] demo scenario seeded' : '[seed] database already has data; left as it is'))
    .catch((err) => { console.error('[seed] failed:', err); process.exitCode = 1; })
    .finally(() => closeDb());
}
