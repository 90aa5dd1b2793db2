// The demo company looks lived-in after the demo seed: most tanks have a signed commissioning
// record with its PDF and photos, and each tank's next inspection follows from its service history,
// a few of them overdue. Checked through the product's own endpoints, against what is stored.
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { call, pdfText, type Api } from '../../support/commissioning';
import { demoTanks } from '../../../src/lib/demo/scenario';

const kestrel = demoTanks().filter((t) => t.companySlug === 'kestrel-vale');
const serials = kestrel.map((t) => t.serial);
let operator: Api;
beforeAll(async () => {
  operator = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'operator', 'kestrel-vale') };
});
afterAll(closeTestDb);

/** 31 Jan + 1 month = 28/29 Feb: calendar months, written out here rather than taken from the product. */
function monthsLater(d: Date, months: number): Date {
  const y = d.getUTCFullYear(),
    m = d.getUTCMonth() + months;
  const last = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
  return new Date(
    Date.UTC(
      y,
      m,
      Math.min(d.getUTCDate(), last),
      d.getUTCHours(),
      d.getUTCMinutes(),
      d.getUTCSeconds(),
      d.getUTCMilliseconds(),
    ),
  );
}

describe('the lived-in demo', () => {
  it('gives most demo tanks a signed commissioning record, with its PDF and a photo or two', async () => {
    const rows = await query<{
      id: string;
      serial: string;
      pdf_key: string | null;
      handover_sent_at: Date | null;
      photos: number;
      signed_at: Date;
      commissioned_at: Date;
    }>(
      `
      select c.id, t.serial, c.pdf_key, c.handover_sent_at, c.signed_at, t.commissioned_at,
        (select count(*)::int from uploads u where u.commissioning_id = c.id and u.kind = 'photo') as photos
      from commissionings c join tanks t on t.id = c.tank_id
      where c.status = 'signed' and t.serial = any($1)`,
      [serials],
    );
    // "Most": seven in eight, as the scenario has it, and at least three quarters of the fleet.
    expect(rows.length).toBe(kestrel.filter((t) => t.commissioning).length);
    expect(rows.length).toBeGreaterThanOrEqual(0.75 * kestrel.length);
    for (const r of rows) {
      expect(r.pdf_key, r.serial).not.toBeNull();
      expect(r.handover_sent_at, r.serial).not.toBeNull();
      expect(r.photos, r.serial).toBeGreaterThanOrEqual(1);
      expect(r.photos, r.serial).toBeLessThanOrEqual(2);
      // Signed on the day the cylinder was commissioned.
      expect(r.signed_at.getTime(), r.serial).toBe(r.commissioned_at.getTime());
    }
    expect(new Set(rows.map((r) => r.photos))).toEqual(new Set([1, 2]));

    // A handful, spread over the fleet: the PDF downloads and says what was signed; the photos are real JPEGs.
    const sample = rows.filter((_, i) => i % 45 === 0);
    for (const r of sample) {
      const pdf = await fetch(`${baseUrl()}/api/commissioning/${r.id}/record.pdf`, {
        headers: { cookie: operator.cookie },
      });
      expect(pdf.status, r.serial).toBe(200);
      expect(pdf.headers.get('content-type')).toBe('application/pdf');
      const text = await pdfText(new Uint8Array(await pdf.arrayBuffer()));
      const t = kestrel.find((k) => k.serial === r.serial)!;
      expect(text).toContain(t.serial);
      expect(text).toContain(t.homeRef);
      expect(text).toContain('engineer@kestrelvale.example.com');

      const page = await call(operator, 'GET', `/commissioning/${r.id}`);
      expect(page.status).toBe(200);
      const photoUrls = [...String(page.body).matchAll(/<img src="(\/api\/uploads\/[0-9a-f-]{36})"/g)].map((m) => m[1]);
      expect(photoUrls.length).toBe(r.photos);
      for (const url of photoUrls) {
        const res = await fetch(`${baseUrl()}${url}`, { headers: { cookie: operator.cookie } });
        expect(res.status).toBe(200);
        const meta = await sharp(Buffer.from(await res.arrayBuffer())).metadata();
        expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 360, 240]);
      }
    }
  }, 60_000);

  it('dates each tank’s next inspection from its service history, and a few are overdue', async () => {
    // Every demo tank is due within a year of its last inspection, so a year's look-ahead lists them all.
    const due = (await call(operator, 'GET', '/api/visits?withinDays=366')).body.due as {
      serial: string;
      dueAt: string;
      state: string;
      lastInspection: string | null;
    }[];
    const listed = new Map(due.filter((d) => serials.includes(d.serial)).map((d) => [d.serial, d]));
    expect(listed.size).toBe(kestrel.length);

    const history = await query<{ serial: string; commissioned_at: Date; last: Date | null; visits: number }>(
      `
      select t.serial, t.commissioned_at, max(v.visited_at) filter (where v.kind = 'annual_inspection') as last, count(v.id)::int as visits
      from tanks t left join service_visits v on v.tank_id = t.id where t.serial = any($1) group by t.serial, t.commissioned_at`,
      [serials],
    );
    const now = Date.now();
    for (const h of history) {
      const t = kestrel.find((k) => k.serial === h.serial)!;
      expect(h.visits, h.serial).toBe(t.inspectionsDaysAgo.length);
      // Unvented cylinders are inspected every 12 months, from the last inspection or from commissioning (common practice).
      const expectedDue = monthsLater(h.last ?? h.commissioned_at, 12);
      const d = listed.get(h.serial)!;
      expect(new Date(d.dueAt).getTime(), h.serial).toBe(expectedDue.getTime());
      expect(d.state === 'overdue', h.serial).toBe(expectedDue.getTime() < now);
      // Overdue exactly where the scenario says the latest inspection was missed.
      expect(d.state === 'overdue', h.serial).toBe(t.inspectionMissed);
    }
    const overdue = [...listed.values()].filter((d) => d.state === 'overdue').length;
    expect(overdue).toBeGreaterThanOrEqual(3);
    expect(overdue).toBeLessThanOrEqual(0.1 * kestrel.length);
  });
});
