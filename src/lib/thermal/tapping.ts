// The 24-hour draw-off patterns ("load profiles") of EN 16147 and Commission Regulation (EU)
// No 814/2013, Annex III (the same table appears in Delegated Regulation (EU) No 812/2013, Annex VII).
// Rows of M and L: from memory, and their energies add up to Qref. Rows of XS, S, XL and XXL: from
// memory and less certain (times especially); their energies add up to Qref as the standard requires.
// Confirm against the regulation text before using them for a declared rating.
import { ThermalInputError } from './errors.js';

/** Load-profile sizes of 814/2013 Annex III covered here (XXS is not). */
export type TappingProfileSize = 'XS' | 'S' | 'M' | 'L' | 'XL' | 'XXL';
/** Kinds of draw named in the tapping tables. */
export type TapType = 'small' | 'large' | 'shower' | 'bath' | 'floor_cleaning' | 'household_cleaning' | 'dishwashing';

/** One draw-off of a tapping cycle. */
export interface TappingDraw {
  /** Clock time of the draw's start, "HH:MM". */ time: string;
  /** Minutes after midnight. */ minuteOfDay: number;
  /** Useful energy of the draw, kWh. */ energyKWh: number;
  /** Kind of draw. */ tap: TapType;
  /** Minimum useful flow, litres per minute. */ flowLpm: number;
  /** Temperature from which hot water counts as useful, °C. */ usefulC: number;
  /** Peak temperature that must be reached during the draw, °C, where the table sets one. */ peakC: number | null;
}

/** A whole tapping cycle and its reference energy. */
export interface TappingProfile {
  size: TappingProfileSize;
  qrefKWh: number;
  draws: TappingDraw[];
}

/** Reference energy Qref of each profile, kWh/day (814/2013 Annex III; EN 16147). */
export const TAPPING_QREF_KWH: Readonly<Record<TappingProfileSize, number>> = {
  XS: 2.1,
  S: 2.1,
  M: 5.845,
  L: 11.655,
  XL: 19.07,
  XXL: 24.53,
};

// Tap kinds: [flow l/min, useful Tm °C, peak Tp °C or null]. Small draws Tm 25; shower and
// household cleaning Tm 40; floor cleaning and bath Tp 40; dishwashing Tp 55 (where Tp is set,
// energy counts from 10 °C). Flows from memory.
const KINDS: Readonly<Record<TapType, readonly [number, number, number | null]>> = {
  small: [3, 25, null],
  large: [5, 45, null],
  shower: [6, 40, null],
  bath: [10, 10, 40],
  floor_cleaning: [3, 10, 40],
  household_cleaning: [3, 40, null],
  dishwashing: [4, 10, 55],
};

type Row = readonly [string, number, TapType];
const sm = (time: string): Row => [time, 0.105, 'small'];

const M_ROWS: readonly Row[] = [
  sm('07:00'),
  ['07:05', 1.4, 'shower'],
  sm('07:30'),
  sm('08:01'),
  sm('08:15'),
  sm('08:30'),
  sm('08:45'),
  sm('09:00'),
  sm('09:30'),
  ['10:30', 0.105, 'floor_cleaning'],
  sm('11:30'),
  sm('11:45'),
  ['12:45', 0.315, 'dishwashing'],
  sm('14:30'),
  sm('15:30'),
  sm('16:30'),
  sm('18:00'),
  ['18:15', 0.105, 'household_cleaning'],
  ['18:30', 0.105, 'household_cleaning'],
  sm('19:00'),
  ['20:30', 0.735, 'dishwashing'],
  sm('21:15'),
  ['21:30', 1.4, 'shower'],
];

const L_ROWS: readonly Row[] = [
  sm('07:00'),
  ['07:05', 1.4, 'shower'],
  sm('07:30'),
  sm('07:45'),
  ['08:05', 3.605, 'bath'],
  sm('08:25'),
  sm('08:30'),
  sm('08:45'),
  sm('09:00'),
  sm('09:30'),
  ['10:30', 0.105, 'floor_cleaning'],
  sm('11:30'),
  sm('11:45'),
  ['12:45', 0.315, 'dishwashing'],
  sm('14:30'),
  sm('15:30'),
  sm('16:30'),
  sm('18:00'),
  ['18:15', 0.105, 'household_cleaning'],
  ['18:30', 0.105, 'household_cleaning'],
  sm('19:00'),
  ['20:30', 0.735, 'dishwashing'],
  ['21:00', 3.605, 'bath'],
  sm('21:30'),
];

const XS_ROWS: readonly Row[] = [
  ['07:30', 0.525, 'small'],
  ['12:45', 0.525, 'small'],
  ['18:00', 0.525, 'small'],
  ['21:30', 0.525, 'small'],
];

const S_ROWS: readonly Row[] = [
  sm('07:00'),
  sm('07:30'),
  sm('08:30'),
  sm('09:30'),
  sm('11:30'),
  sm('11:45'),
  ['12:45', 0.315, 'dishwashing'],
  sm('18:00'),
  sm('18:15'),
  ['20:30', 0.42, 'dishwashing'],
  ['21:30', 0.525, 'large'],
];

// XL and XXL share their pattern; only the bath energy differs (4.42 and 6.24 kWh).
function xlRows(bathKWh: number): Row[] {
  return [
    sm('07:00'),
    ['07:15', 1.82, 'shower'],
    sm('07:26'),
    ['07:45', bathKWh, 'bath'],
    sm('08:01'),
    sm('08:15'),
    sm('08:30'),
    sm('08:45'),
    sm('09:00'),
    sm('09:30'),
    sm('10:00'),
    ['10:30', 0.105, 'floor_cleaning'],
    sm('11:00'),
    sm('11:30'),
    sm('11:45'),
    ['12:45', 0.735, 'dishwashing'],
    sm('14:30'),
    sm('15:00'),
    sm('15:30'),
    sm('16:00'),
    sm('16:30'),
    sm('17:00'),
    sm('18:00'),
    ['18:15', 0.105, 'household_cleaning'],
    ['18:30', 0.105, 'household_cleaning'],
    sm('19:00'),
    ['20:30', 0.735, 'dishwashing'],
    sm('20:45'),
    ['20:46', bathKWh, 'bath'],
    ['21:30', bathKWh, 'bath'],
  ];
}

const ROWS: Readonly<Record<TappingProfileSize, readonly Row[]>> = {
  XS: XS_ROWS,
  S: S_ROWS,
  M: M_ROWS,
  L: L_ROWS,
  XL: xlRows(4.42),
  XXL: xlRows(6.24),
};

const SIZES = Object.keys(ROWS) as TappingProfileSize[];

/**
 * The 24-hour tapping cycle of profile `size` ('XS' … 'XXL'): each draw's time, useful energy (kWh),
 * tap type, minimum flow (l/min), useful temperature Tm and peak temperature Tp (°C). A fresh copy
 * on every call; the draws' energies add up to the profile's Qref.
 */
export function tappingProfile(size: TappingProfileSize): TappingProfile {
  if (!SIZES.includes(size)) {
    throw new ThermalInputError('size', `size is ${String(size)}: it must be one of ${SIZES.join(', ')}.`);
  }
  const draws = ROWS[size].map(([time, energyKWh, tap]): TappingDraw => {
    const [flowLpm, usefulC, peakC] = KINDS[tap];
    const [hh, mm] = time.split(':').map(Number) as [number, number];
    return { time, minuteOfDay: hh * 60 + mm, energyKWh, tap, flowLpm, usefulC, peakC };
  });
  return { size, qrefKWh: TAPPING_QREF_KWH[size], draws };
}
