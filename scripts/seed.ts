// Seeds the invented demo scenario into an empty database (does nothing if companies exist), and
// then, once object storage is up, the documents of its signed commissioning records.
import { randomUUID } from 'node:crypto';
import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import { closeDb, db } from '../src/db';
import {
  commissionings,
  companies,
  homeMembers,
  homes,
  memberships,
  serviceVisits,
  tanks,
  tariffs,
  uploads,
  users,
} from '../src/db/schema';
import { recordPdfKey, recordView, type SignedRecord } from '../src/lib/commissioning/record';
import { demoSignedRecord } from '../src/lib/demo/commissioning';
import { dataPlatePhoto, installationPhoto } from '../src/lib/demo/photos.server';
import { commissioningPdf } from '../src/lib/documents/commissioning-pdf';
import { parseTariff, type Tariff } from '../src/lib/energy';
import { demoAccounts, demoCompanies, demoTanks } from '../src/lib/demo/scenario';
import { putObject } from '../src/lib/storage/objects.server';
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
    {
      kind: 'flat',
      name: 'Wendmoor Standard (demo)',
      unit: 'p/kWh',
      import: 24.5,
      export: 15,
      validFrom: '2025-01-01T00:00:00Z',
      validTo: '2026-04-01T00:00:00Z',
    },
    {
      kind: 'day_night',
      name: 'Wendmoor Night Saver (demo)',
      unit: 'p/kWh',
      timeZone: 'Europe/London',
      nightStart: '00:30',
      nightEnd: '05:30',
      dayImport: 27,
      nightImport: 8.5,
      export: 15,
      validFrom: '2026-04-01T00:00:00Z',
    },
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
      const [row] = await tx
        .insert(companies)
        .values({ slug: c.slug, name: c.name, emailDomain: c.emailDomain })
        .returning();
      companyIds.set(c.slug, row.id);
    }
    for (const t of demoDefaultTariffs()) {
      await tx.insert(tariffs).values({
        companyId: companyIds.get('kestrel-vale')!,
        homeId: null,
        kind: t.kind,
        name: t.name ?? null,
        validFrom: new Date(t.validFromMs),
        validTo: t.validToMs === null ? null : new Date(t.validToMs),
        prices: t,
      });
    }
    // Accounts first: the demo engineer signed the records and made the visits.
    const passwordHash = await hashPassword(env().DEMO_PASSWORD);
    const accounts: (ReturnType<typeof demoAccounts>[number] & { id: string })[] = [];
    for (const a of demoAccounts()) {
      const [u] = await tx
        .insert(users)
        .values({ email: a.email, name: a.name, passwordHash, emailVerified: new Date() })
        .returning({ id: users.id });
      await tx.insert(memberships).values({ userId: u.id, companyId: companyIds.get(a.companySlug)!, role: a.role });
      accounts.push({ ...a, id: u.id });
    }
    const engineerOf = (slug: string) => accounts.find((a) => a.companySlug === slug && a.role === 'engineer')!;
    const companyName = new Map(demoCompanies.map((c) => [c.slug, c.name]));
    const firstHome = new Map<string, string>();
    const visits: (typeof serviceVisits.$inferInsert)[] = [];
    const records: (typeof commissionings.$inferInsert)[] = [];
    const daysAgo = (d: number) => new Date(Date.now() - d * 86_400_000);
    for (const t of demoTanks()) {
      const companyId = companyIds.get(t.companySlug)!;
      const engineer = engineerOf(t.companySlug);
      const [home] = await tx
        .insert(homes)
        .values({
          companyId,
          reference: t.homeRef,
          addressLine: t.addressLine,
          town: t.town,
          postcode: t.postcode,
          occupants: t.occupants,
          hasSolar: t.hasSolar,
          contactName: t.contactName,
          contactEmail: t.contactEmail,
        })
        .returning({ id: homes.id });
      if (!firstHome.has(t.companySlug)) firstHome.set(t.companySlug, home.id);
      const commissionedAt = daysAgo(t.commissionedDaysAgo);
      const [tank] = await tx
        .insert(tanks)
        .values({
          companyId,
          homeId: home.id,
          serial: t.serial,
          model: t.model,
          volumeL: t.volumeL,
          heightM: t.heightM,
          sensorCount: t.sensorCount,
          heatSource: t.heatSource,
          hpOutputW: t.hpOutputW,
          immersionW: t.immersionW,
          declaredLossW: t.declaredLossW,
          targetC: t.targetC,
          hysteresisK: t.hysteresisK,
          commissionedAt,
          deviceTokenHash: demoTokenHash(t.serial),
        })
        .returning({ id: tanks.id });
      for (const d of t.inspectionsDaysAgo) {
        visits.push({
          companyId,
          tankId: tank.id,
          kind: 'annual_inspection',
          visitedAt: daysAgo(d),
          engineerUserId: engineer.id,
          findings:
            'Annual inspection (demo record): relief valves operated, expansion provision checked, no faults found.',
          readings: { reliefValveTested: true, dischargeChecked: true, inletPressureBar: 3, vesselPrechargeBar: 3 },
        });
      }
      if (t.commissioning) {
        const id = randomUUID();
        const record = demoSignedRecord(t, t.commissioning, {
          recordId: id,
          companyName: companyName.get(t.companySlug)!,
          engineer: { name: engineer.name, email: engineer.email },
          signedAt: commissionedAt,
        });
        records.push({
          id,
          companyId,
          engineerUserId: engineer.id,
          status: 'signed',
          step: 'signoff',
          data: record.answers as unknown as Record<string, unknown>,
          homeId: home.id,
          tankId: tank.id,
          record: record as unknown as Record<string, unknown>,
          signedAt: commissionedAt,
          signedBy: engineer.id,
          // Handed over on the day; the PDF is stored by seedDemoDocuments() once object storage is up.
          handoverSentAt: commissionedAt,
          createdAt: new Date(commissionedAt.getTime() - 3 * 3_600_000),
          updatedAt: commissionedAt,
        });
      }
    }
    if (visits.length > 0) await tx.insert(serviceVisits).values(visits);
    if (records.length > 0) await tx.insert(commissionings).values(records);
    for (const a of accounts) {
      if (a.role === 'householder')
        await tx.insert(homeMembers).values({ homeId: firstHome.get(a.companySlug)!, userId: a.id });
    }
  });
  return true;
}

/** Runs `work` over `items`, `limit` at a time. */
async function eachLimited<T>(
  items: readonly T[],
  limit: number,
  work: (item: T, index: number) => Promise<void>,
): Promise<void> {
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(limit, items.length) }, async () => {
      while (next < items.length) {
        const i = next++;
        await work(items[i]!, i);
      }
    }),
  );
}

/**
 * Stores the documents of the demo's signed commissioning records that have none yet: the photos
 * attached before sign-off and the record's PDF (made by the product's own PDF code). Needs object
 * storage running; safe to run again (it picks up where it stopped). Returns how many it stored.
 */
export async function seedDemoDocuments(): Promise<number> {
  const demo = new Map(demoTanks().map((t) => [t.serial, t]));
  const rows = await db()
    .select({
      id: commissionings.id,
      companyId: commissionings.companyId,
      tankId: commissionings.tankId,
      engineerUserId: commissionings.engineerUserId,
      record: commissionings.record,
    })
    .from(commissionings)
    .innerJoin(companies, eq(companies.id, commissionings.companyId))
    .where(
      and(
        eq(commissionings.status, 'signed'),
        isNull(commissionings.pdfKey),
        inArray(
          companies.slug,
          demoCompanies.map((c) => c.slug),
        ),
      ),
    );
  let stored = 0;
  await eachLimited(rows, 8, async (row, i) => {
    const record = row.record as unknown as SignedRecord;
    const t = demo.get(record.serial);
    if (!t?.commissioning) return;
    const signedMs = Date.parse(record.signedAt);
    for (const kind of t.commissioning.photos) {
      const photo = kind === 'data_plate' ? await dataPlatePhoto(t) : await installationPhoto(i);
      const storageKey = `${row.companyId}/commissioning/${row.id}/${photo.filename}`;
      await putObject(storageKey, photo.body, 'image/jpeg');
      await db()
        .insert(uploads)
        .values({
          companyId: row.companyId,
          commissioningId: row.id,
          tankId: row.tankId,
          visitId: null,
          kind: 'photo',
          filename: photo.filename,
          contentType: 'image/jpeg',
          bytes: photo.body.length,
          width: photo.width,
          height: photo.height,
          downscaled: false,
          storageKey,
          uploadedBy: row.engineerUserId,
          createdAt: new Date(signedMs - 3_600_000),
        })
        .onConflictDoNothing();
    }
    const key = recordPdfKey(row.companyId, row.id);
    await putObject(key, Buffer.from(await commissioningPdf(recordView(record))), 'application/pdf');
    await db().update(commissionings).set({ pdfKey: key }).where(eq(commissionings.id, row.id));
    stored++;
  });
  return stored;
}

/** `seedDemoDocuments()` for `npm start` and `npm test`, once their services are up: says what it did and how long it took. */
export async function storeDemoDocuments(): Promise<void> {
  const t0 = performance.now();
  try {
    const n = await seedDemoDocuments();
    if (n > 0)
      console.log(
        `[seed] documents of ${n} demo commissioning records stored (${((performance.now() - t0) / 1000).toFixed(1)} s)`,
      );
  } finally {
    await closeDb();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  seedIfEmpty()
    .then((did) => console.log(did ? '[seed] demo scenario seeded' : '[seed] database already has data; left as it is'))
    .then(() => seedDemoDocuments())
    .then((n) => {
      if (n > 0) console.log(`[seed] documents of ${n} demo commissioning records stored`);
    })
    .catch((err) => {
      console.error('[seed] failed:', err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
