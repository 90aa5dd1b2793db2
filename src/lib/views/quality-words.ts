// How the quality of a tank's figures is put into words: short marks for the desk's tables, and
// plain sentences for householders (never a number the sensors cannot back). Pure, island-safe.
import type { FiguresQuality } from '../thermal';

type Quality = Pick<FiguresQuality, 'status' | 'leftOut' | 'reason'>;

const sensors = (xs: readonly number[]) =>
  xs.length === 1 ? `sensor ${xs[0]}` : `sensors ${xs.slice(0, -1).join(', ')} and ${xs.at(-1)}`;

/** A table cell's mark: null when measured; "est., sensor 3 left out"; "withheld, sensors 2 and 3 out". */
export function qualityMark(q: Quality): string | null {
  if (q.status === 'measured') return null;
  if (q.status === 'estimated') return `est., ${sensors(q.leftOut)} left out`;
  return q.leftOut.length ? `withheld, ${sensors(q.leftOut)} out` : 'withheld, no reading';
}

/** What a householder reads beside (or instead of) the litres. */
export function householdWords(q: Quality): string | null {
  if (q.status === 'measured') return null;
  const one = q.leftOut.length === 1;
  if (q.status === 'estimated')
    return `${one ? 'One of the temperature sensors' : 'Some of the temperature sensors'} in your cylinder ${one ? 'is' : 'are'} not working, so this is our best estimate from the others.`;
  if (q.leftOut.length === 0) return 'We cannot tell right now: your cylinder has not sent any readings yet.';
  return `We cannot tell right now: ${one ? 'a temperature sensor' : 'temperature sensors'} in your cylinder ${one ? 'is' : 'are'} not working, and without ${one ? 'it' : 'them'} we would only be guessing. Your installer can see this too.`;
}
