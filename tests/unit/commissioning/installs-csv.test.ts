import { describe, expect, it } from 'vitest';
import { installsTemplate, parseInstalls } from '../../../src/lib/imports/installs-csv';
import { installRow, installsHeader } from '../../support/commissioning';

describe('CSV of existing installs', () => {
  it('reads the template’s example row', () => {
    const r = parseInstalls(installsTemplate());
    expect(r.errors).toEqual([]);
    expect(r.rows).toHaveLength(1);
    expect(r.rows[0].value.tank).toMatchObject({
      serial: 'C210-EX-0001',
      volumeL: 210,
      sensorCount: 12,
      heatSource: 'hp_plate',
      targetC: 60,
    });
    expect(r.rows[0].value.tank.commissionedAt?.toISOString()).toBe('2024-05-14T12:00:00.000Z');
  });

  it('reports each bad row by line and column', () => {
    const text = [
      installsHeader,
      installRow(),
      installRow({ volume_l: 'lots' }),
      installRow({ heat_source: 'gas' }),
      installRow(),
      installRow({ serial: 'bad serial!', commissioned_on: '2024-02-30' }),
      installRow({ heat_pump_output_w: '' }),
    ].join('\n');
    const r = parseInstalls(text);
    expect(r.total).toBe(6);
    expect(r.errors.map((e) => [e.row, e.field])).toEqual([
      [3, 'volume_l'],
      [4, 'heat_source'],
      [6, 'serial'],
      [6, 'commissioned_on'],
      [7, 'heat_pump_output_w'],
    ]);
    expect(r.errors[0].message).toBe('volume_l must be a number.');
    expect(r.errors[1].message).toBe('heat_source must be one of hp_plate, hp_coil, immersion_only, boiler_coil.');
    expect(r.errors[3].message).toBe('commissioned_on is not a real date.');
  });

  it('finds a serial or reference repeated inside the file', () => {
    const a = installRow();
    const serial = a.split(',')[7];
    const r = parseInstalls([installsHeader, a, installRow({ serial })].join('\n'));
    expect(r.errors).toEqual([{ row: 3, field: 'serial', message: `serial ${serial} is also on line 2.` }]);
  });

  it('refuses a file without the required columns, or not CSV at all', () => {
    expect(parseInstalls('serial,model\nA1,C1\n').errors[0]).toMatchObject({
      row: 1,
      field: '(header)',
      message: expect.stringMatching(/^The header lacks home_reference, address/),
    });
    expect(parseInstalls(`${installsHeader}\n"unclosed,quote\n`).errors[0]).toMatchObject({
      field: '(file)',
      message: expect.stringMatching(/not valid CSV/),
    });
  });
});
