// Existing installs from a CSV file: one row per home and its cylinder. Parsing and per-row
// checks are pure; checks against what is already stored are in installs.server.ts.
import { parse } from 'csv-parse/sync';
import { z } from '@/lib/zod';
import type { ImportRow } from '../../db/queries/commissioning';
import { hasHeatPump, heatSourceKinds } from '../heat-sources';
import { SERIAL_PATTERN } from '../telemetry/wire';

export const installColumns = [
  'home_reference',
  'address',
  'town',
  'postcode',
  'occupants',
  'householder_name',
  'householder_email',
  'serial',
  'cylinder_model',
  'volume_l',
  'height_m',
  'sensor_count',
  'heat_source',
  'heat_pump_output_w',
  'immersion_w',
  'declared_loss_w',
  'target_c',
  'commissioned_on',
] as const;
type Column = (typeof installColumns)[number];
const optionalColumns: Column[] = [
  'householder_name',
  'householder_email',
  'heat_pump_output_w',
  'declared_loss_w',
  'target_c',
  'commissioned_on',
];

export const MAX_IMPORT_ROWS = 5000;
export const MAX_IMPORT_BYTES = 2 * 1024 * 1024;

/** The downloadable template: the header and one invented example row. */
export function installsTemplate(): string {
  const example = [
    'KV-9001',
    '14 Example Row',
    'Larkholt',
    'WM4 7QX',
    '3',
    'Sam Example',
    'sam@example.com',
    'C210-EX-0001',
    'C210 cylinder',
    '210',
    '1.60',
    '12',
    'hp_plate',
    '8000',
    '3000',
    '1.6',
    '60',
    '2024-05-14',
  ];
  return `${installColumns.join(',')}\n${example.join(',')}\n`;
}

const blank = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const num = (column: string, min: number, max: number, int = false) => {
  let n = z.coerce.number({ error: `${column} must be a number.` });
  if (int) n = n.int(`${column} must be a whole number.`);
  return n.min(min, `${column} must be at least ${min}.`).max(max, `${column} must be at most ${max}.`);
};
const req = (column: string, max = 200) =>
  z.string().trim().min(1, `${column} is empty.`).max(max, `${column} is longer than ${max} characters.`);

const rowSchema = z
  .object({
    home_reference: req('home_reference', 40),
    address: req('address'),
    town: req('town', 80),
    postcode: req('postcode', 12),
    occupants: num('occupants', 1, 20, true),
    householder_name: z.preprocess(blank, z.string().max(120).optional()),
    householder_email: z.preprocess(
      blank,
      z.string().trim().toLowerCase().email('householder_email is not an e-mail address.').optional(),
    ),
    serial: z
      .string()
      .trim()
      .regex(
        SERIAL_PATTERN,
        'serial must be letters, digits, dots, dashes or underscores (at most 64), starting with a letter or digit.',
      ),
    cylinder_model: req('cylinder_model', 80),
    volume_l: num('volume_l', 30, 2000, true),
    height_m: num('height_m', 0.3, 4),
    sensor_count: num('sensor_count', 1, 64, true),
    heat_source: z.enum(heatSourceKinds, { error: `heat_source must be one of ${heatSourceKinds.join(', ')}.` }),
    heat_pump_output_w: z.preprocess(blank, num('heat_pump_output_w', 0, 50000, true).optional()),
    immersion_w: num('immersion_w', 0, 12000, true),
    declared_loss_w: z.preprocess(blank, num('declared_loss_w', 0, 500).optional()),
    target_c: z.preprocess(blank, num('target_c', 40, 75).optional()),
    commissioned_on: z.preprocess(
      blank,
      z
        .string()
        .regex(/^\d{4}-\d{2}-\d{2}$/, 'commissioned_on must be a date written YYYY-MM-DD.')
        .refine(
          (d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d),
          'commissioned_on is not a real date.',
        )
        .refine((d) => Date.parse(`${d}T00:00:00Z`) <= Date.now(), 'commissioned_on cannot be in the future.')
        .optional(),
    ),
  })
  .superRefine((r, ctx) => {
    if (hasHeatPump(r.heat_source) && !r.heat_pump_output_w) {
      ctx.addIssue({
        code: 'custom',
        path: ['heat_pump_output_w'],
        message: 'heat_pump_output_w is needed when the heat source is a heat pump.',
      });
    }
  });

export interface RowError {
  row: number;
  field: string;
  message: string;
}
export interface ParsedInstalls {
  rows: { line: number; value: ImportRow }[];
  errors: RowError[];
  total: number;
}

/** Parses and checks every row; the file imports only when `errors` is empty. */
export function parseInstalls(text: string): ParsedInstalls {
  let records: { record: Record<string, string>; info: { lines: number } }[];
  try {
    records = parse(text, {
      columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()),
      skip_empty_lines: true,
      trim: true,
      bom: true,
      relax_column_count: true,
      info: true,
    });
  } catch (err) {
    const line = (err as { lines?: number }).lines;
    return {
      rows: [],
      total: 0,
      errors: [
        {
          row: line ?? 0,
          field: '(file)',
          message: `The file is not valid CSV${line ? ` near line ${line}` : ''}: ${(err as Error).message}`,
        },
      ],
    };
  }
  const header = text
    .replace(/^\uFEFF/, '')
    .split(/\r?\n/, 1)[0]
    .split(',')
    .map((c) => c.trim().toLowerCase().replace(/^"|"$/g, ''));
  const missing = installColumns.filter((c) => !optionalColumns.includes(c) && !header.includes(c));
  if (missing.length)
    return {
      rows: [],
      total: records.length,
      errors: [
        { row: 1, field: '(header)', message: `The header lacks ${missing.join(', ')}. Start from the template.` },
      ],
    };
  if (records.length === 0)
    return {
      rows: [],
      total: 0,
      errors: [{ row: 0, field: '(file)', message: 'The file has no rows under its header.' }],
    };
  if (records.length > MAX_IMPORT_ROWS)
    return {
      rows: [],
      total: records.length,
      errors: [
        {
          row: 0,
          field: '(file)',
          message: `The file has ${records.length} rows; import at most ${MAX_IMPORT_ROWS} at a time.`,
        },
      ],
    };

  const errors: RowError[] = [];
  const rows: ParsedInstalls['rows'] = [];
  const seenSerial = new Map<string, number>();
  const seenRef = new Map<string, number>();
  for (const { record, info } of records) {
    const line = info.lines;
    const r = rowSchema.safeParse(record);
    if (!r.success) {
      for (const i of r.error.issues)
        errors.push({ row: line, field: String(i.path[0] ?? '(row)'), message: i.message });
      continue;
    }
    const v = r.data;
    const serialKey = v.serial.toLowerCase();
    if (seenSerial.has(serialKey))
      errors.push({
        row: line,
        field: 'serial',
        message: `serial ${v.serial} is also on line ${seenSerial.get(serialKey)}.`,
      });
    else seenSerial.set(serialKey, line);
    if (seenRef.has(v.home_reference))
      errors.push({
        row: line,
        field: 'home_reference',
        message: `home_reference ${v.home_reference} is also on line ${seenRef.get(v.home_reference)}.`,
      });
    else seenRef.set(v.home_reference, line);
    rows.push({
      line,
      value: {
        home: {
          reference: v.home_reference,
          addressLine: v.address,
          town: v.town,
          postcode: v.postcode,
          occupants: v.occupants,
          contactName: v.householder_name ?? null,
          contactEmail: v.householder_email ?? null,
        },
        tank: {
          serial: v.serial,
          model: v.cylinder_model,
          volumeL: v.volume_l,
          heightM: v.height_m,
          sensorCount: v.sensor_count,
          heatSource: v.heat_source,
          hpOutputW: v.heat_pump_output_w ?? 0,
          immersionW: v.immersion_w,
          declaredLossW: v.declared_loss_w ?? null,
          targetC: v.target_c ?? 60,
          commissionedAt: v.commissioned_on ? new Date(`${v.commissioned_on}T12:00:00Z`) : null,
        },
      },
    });
  }
  return { rows, errors, total: records.length };
}
