import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { installRow, installsHeader } from '../../support/commissioning';

let admin: string;
beforeAll(async () => {
  admin = await signInAs(baseUrl(), 'admin', 'kestrel-vale');
});
afterAll(closeTestDb);

const post = (path: string, csv: string, cookie = admin) =>
  fetch(`${baseUrl()}${path}`, {
    method: 'POST',
    headers: { origin: baseUrl(), cookie, 'content-type': 'text/csv' },
    body: csv,
  });

/** How many of the file's cylinders (and, separately, homes) are stored: other tests add tanks meanwhile. */
const serialsOf = (rows: string[]) => rows.map((r) => r.split(',')[7]);
const referencesOf = (rows: string[]) => rows.map((r) => r.split(',')[0]);
const storedTanks = async (rows: string[]) =>
  (await query('select id from tanks where serial = any($1)', [serialsOf(rows)])).length;
const storedHomes = async (rows: string[]) =>
  (await query('select id from homes where reference = any($1)', [referencesOf(rows)])).length;

describe('bulk import of existing installs', () => {
  it('serves a template that itself imports cleanly in a preview', async () => {
    const res = await fetch(`${baseUrl()}/api/imports/installs/template.csv`, { headers: { cookie: admin } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    const preview = await (await post('/api/imports/installs/preview', await res.text())).json();
    expect(preview).toEqual({ total: 1, valid: 1, errors: [] });
  });

  it('imports nothing from a file with good and bad rows, and reports each bad row', async () => {
    const [taken] = await query<{ serial: string }>(
      "select t.serial from tanks t join companies c on c.id = t.company_id where c.slug = 'orrin-bay' limit 1",
    );
    const rows = [
      installRow(),
      installRow({ occupants: '0' }),
      installRow(),
      installRow({ serial: taken.serial }),
      installRow({ householder_email: 'nobody-at-example' }),
    ];
    const csv = [installsHeader, ...rows].join('\n');

    const preview = await (await post('/api/imports/installs/preview', csv)).json();
    expect(preview.total).toBe(5);
    expect(preview.valid).toBe(2);
    expect(preview.errors).toEqual([
      { row: 3, field: 'occupants', message: 'occupants must be at least 1.' },
      { row: 5, field: 'serial', message: `serial ${taken.serial} is already registered.` },
      { row: 6, field: 'householder_email', message: 'householder_email is not an e-mail address.' },
    ]);

    const res = await post('/api/imports/installs', csv);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe('ImportHasErrors');
    expect(body.error.message).toBe(
      'Nothing was imported: 3 of 5 rows have problems. Fix them and import the whole file again.',
    );
    expect(body.error.fields.map((f: { field: string }) => f.field)).toEqual([
      'row 3: occupants',
      'row 5: serial',
      'row 6: householder_email',
    ]);
    // Not even the good rows (lines 2 and 4) were stored.
    expect(await storedTanks([rows[0], rows[2]])).toBe(0);
    expect(await storedHomes(rows)).toBe(0);
  });

  it('imports every row of a good file, homes and cylinders together', async () => {
    const rows = [
      installRow(),
      installRow({ heat_source: 'immersion_only', heat_pump_output_w: '' }),
      installRow({ commissioned_on: '' }),
    ];
    const res = await post('/api/imports/installs', [installsHeader, ...rows].join('\r\n'));
    expect(res.status).toBe(201);
    expect(await res.json()).toEqual({ imported: 3 });
    expect([await storedTanks(rows), await storedHomes(rows)]).toEqual([3, 3]);
    const serials = serialsOf(rows);
    const stored = await query<{
      serial: string;
      heat_source: string;
      reference: string;
      company: string;
      commissioned_at: Date | null;
    }>(
      `select t.serial, t.heat_source, h.reference, c.slug as company, t.commissioned_at from tanks t join homes h on h.id = t.home_id join companies c on c.id = t.company_id where t.serial = any($1) order by t.serial`,
      [serials],
    );
    expect(stored).toHaveLength(3);
    expect(new Set(stored.map((s) => s.company))).toEqual(new Set(['kestrel-vale']));
    expect(stored.find((s) => s.serial === serials[1])?.heat_source).toBe('immersion_only');
    expect(stored.find((s) => s.serial === serials[2])?.commissioned_at).toBeNull();
    // The same file again: every row now clashes, and nothing more is stored.
    const again = await post('/api/imports/installs', [installsHeader, ...rows].join('\n'));
    expect(again.status).toBe(422);
    expect([await storedTanks(rows), await storedHomes(rows)]).toEqual([3, 3]);
  });

  it('is for company administrators only', async () => {
    const engineer = await signInAs(baseUrl(), 'engineer', 'kestrel-vale');
    expect((await post('/api/imports/installs', `${installsHeader}\n${installRow()}`, engineer)).status).toBe(403);
  });
});
