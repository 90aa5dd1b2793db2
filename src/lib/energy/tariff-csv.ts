// Half-hourly prices uploaded as CSV. All or nothing: either every row is valid and together they
// form one contiguous run of 30-minute slots, or the upload is refused with every bad row's line
// number and reason, and nothing is kept.
//
// Format (header required, names case-insensitive, any order):
//   start,end,import,export,unit
//   2025-01-06T00:00:00Z,2025-01-06T00:30:00Z,14.2,4.1,p/kWh
// `start`/`end` are ISO 8601 instants with a zone (Z or ±HH:MM; a bare local time is ambiguous on
// clock-change nights and refused). `export` may be left out (0). `unit` is p/kWh or £/kWh per row,
// or left out when the caller names one unit for the whole file.
import { parse } from 'csv-parse/sync';
import { priceProblem, pencePerUnit, priceUnits } from './tariff.js';
import type { HalfHourlyTariff, PriceUnit } from './tariff.js';
import { HALF_HOUR_MS } from './units.js';

/** One refused row: `row` is the line number in the file (the header is line 1). */
export interface TariffRowError {
  /** Line number in the file, 1 = header. */ row: number;
  /** Column at fault, or `row` when the whole line is. */ field:
    | 'start'
    | 'end'
    | 'import'
    | 'export'
    | 'unit'
    | 'row'
    | 'header';
  /** Why, in a full sentence. */ message: string;
}

/** Options of {@link parseHalfHourlyCsv}. */
export interface HalfHourlyCsvOptions {
  /** Unit of every price when the file has no `unit` column. */ unit?: PriceUnit;
  /** Accept negative import prices (down to −100 p/kWh), for tariffs that pay for using power at times. Default false. */ negativeImportAllowed?: boolean;
  /** Name to give the tariff. */ name?: string;
}

/** Most rows one upload may carry: three years of half hours (product limit). */
const MAX_CSV_ROWS = 3 * 366 * 48;

const COLUMNS = ['start', 'end', 'import', 'export', 'unit'] as const;
const INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/;

interface Slot {
  row: number;
  startMs: number;
  importPence: number;
  exportPence: number;
  valid: boolean;
}

function iso(ms: number): string {
  return new Date(ms).toISOString().replace('.000Z', 'Z');
}

/**
 * Parse an upload of half-hourly prices into a {@link HalfHourlyTariff} (prices converted to p/kWh),
 * or list every bad row: unparseable times, slots not 30 minutes long or not on a half hour, unknown
 * units, missing, negative or implausible prices, and gaps or overlaps between slots (rows may come in
 * any order; they are checked in time order).
 */
export function parseHalfHourlyCsv(
  text: string,
  options: HalfHourlyCsvOptions = {},
): { ok: true; tariff: HalfHourlyTariff } | { ok: false; errors: TariffRowError[] } {
  const errors: TariffRowError[] = [];
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, { bom: true, info: true, relax_column_count: true, skip_empty_lines: true, trim: true });
  } catch (cause) {
    const line = (cause as { lines?: number }).lines ?? 1;
    return {
      ok: false,
      errors: [{ row: line, field: 'row', message: `Line ${line} is not valid CSV: ${(cause as Error).message}` }],
    };
  }
  if (records.length === 0)
    return {
      ok: false,
      errors: [
        {
          row: 1,
          field: 'header',
          message: 'The file is empty: it needs a header line start,end,import,export,unit and one line per half hour.',
        },
      ],
    };

  const header = records[0]!.record.map((h) => h.toLowerCase());
  const col = new Map<string, number>();
  header.forEach((h, i) => {
    if (!(COLUMNS as readonly string[]).includes(h))
      errors.push({
        row: 1,
        field: 'header',
        message: `Column "${h}" is not known: the columns are ${COLUMNS.join(', ')}.`,
      });
    else if (col.has(h)) errors.push({ row: 1, field: 'header', message: `Column "${h}" appears twice.` });
    else col.set(h, i);
  });
  for (const required of ['start', 'end', 'import'] as const) {
    if (!col.has(required))
      errors.push({ row: 1, field: 'header', message: `The header has no "${required}" column.` });
  }
  if (!col.has('unit') && !options.unit)
    errors.push({
      row: 1,
      field: 'header',
      message: 'The header has no "unit" column and no unit was chosen for the file: give p/kWh or £/kWh.',
    });
  if (records.length - 1 > MAX_CSV_ROWS)
    errors.push({
      row: 1,
      field: 'row',
      message: `The file has ${records.length - 1} price lines; at most ${MAX_CSV_ROWS} fit in one upload.`,
    });
  if (records.length === 1) errors.push({ row: 1, field: 'row', message: 'The file has a header but no prices.' });
  if (errors.length) return { ok: false, errors };

  const slots: Slot[] = [];
  for (let r = 1; r < records.length; r++) {
    const { record, info } = records[r]!;
    const row = info.lines;
    const bad = (field: TariffRowError['field'], message: string): void => {
      errors.push({ row, field, message: `Line ${row}: ${message}` });
    };
    if (record.length !== header.length) {
      bad('row', `has ${record.length} fields where the header has ${header.length}.`);
      continue;
    }
    const cell = (name: string): string => (col.has(name) ? record[col.get(name)!]! : '');
    const before = errors.length;

    const time = (name: 'start' | 'end'): number => {
      const s = cell(name);
      const ms = INSTANT.test(s) ? Date.parse(s) : NaN;
      if (Number.isNaN(ms))
        bad(name, `${name} "${s}" is not an ISO 8601 date and time with a zone, such as 2025-01-06T00:00:00Z.`);
      return ms;
    };
    const startMs = time('start');
    const endMs = time('end');
    let timesOk = false;
    if (!Number.isNaN(startMs) && !Number.isNaN(endMs)) {
      if (endMs - startMs !== HALF_HOUR_MS)
        bad(
          'end',
          `the slot from ${cell('start')} to ${cell('end')} lasts ${(endMs - startMs) / 60_000} minutes; every slot must last 30 minutes.`,
        );
      else if (startMs % HALF_HOUR_MS !== 0) bad('start', `start ${cell('start')} is not on the hour or half hour.`);
      else timesOk = true;
    }

    const unitText = col.has('unit') ? cell('unit') : options.unit!;
    const unit = (priceUnits as readonly string[]).includes(unitText) ? (unitText as PriceUnit) : null;
    if (!unit) bad('unit', `unit "${unitText}" is not known: use p/kWh or £/kWh.`);

    const price = (name: 'import' | 'export'): number => {
      const s = cell(name);
      if (name === 'export' && s === '') return 0;
      const v = /^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(s) ? Number(s) : NaN;
      if (Number.isNaN(v)) {
        bad(name, `${name} "${s}" is not a number.`);
        return NaN;
      }
      if (!unit) return NaN;
      const pence = v * pencePerUnit(unit);
      const problem = priceProblem(pence, name, options.negativeImportAllowed === true);
      if (problem) bad(name, `${name} ${problem}.`);
      return pence;
    };
    const importPence = price('import');
    const exportPence = price('export');
    // A row with good times but a bad price still takes its place in time, so that it is not also
    // reported as a gap on the next line.
    if (timesOk) slots.push({ row, startMs, importPence, exportPence, valid: errors.length === before });
  }

  slots.sort((a, b) => a.startMs - b.startMs || a.row - b.row);
  for (let i = 1; i < slots.length; i++) {
    const prev = slots[i - 1]!;
    const cur = slots[i]!;
    const prevEnd = prev.startMs + HALF_HOUR_MS;
    if (cur.startMs < prevEnd) {
      errors.push({
        row: cur.row,
        field: 'start',
        message: `Line ${cur.row}: the slot starting ${iso(cur.startMs)} overlaps line ${prev.row} (${iso(prev.startMs)} to ${iso(prevEnd)}).`,
      });
    } else if (cur.startMs > prevEnd) {
      errors.push({
        row: cur.row,
        field: 'start',
        message: `Line ${cur.row}: no prices from ${iso(prevEnd)} to ${iso(cur.startMs)}, a gap of ${(cur.startMs - prevEnd) / 60_000} minutes after line ${prev.row}.`,
      });
    }
  }
  if (errors.length) {
    errors.sort((a, b) => a.row - b.row);
    return { ok: false, errors };
  }
  const first = slots[0]!.startMs;
  return {
    ok: true,
    tariff: {
      kind: 'half_hourly',
      ...(options.name ? { name: options.name } : {}),
      validFromMs: first,
      validToMs: first + slots.length * HALF_HOUR_MS,
      importPence: slots.map((s) => s.importPence),
      exportPence: slots.map((s) => s.exportPence),
    },
  };
}
