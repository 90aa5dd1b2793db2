// The householder's shower and bath sizes as typed on /home, checked before they count: whole or
// decimal litres (a decimal comma reads as a point) within sizes a home can have. Browser-safe.
import { z } from '@/lib/zod';

/** Smallest and largest sizes taken, litres at 40 °C: a short shower to a large bath (common practice). */
export const SHOWER_L = { min: 5, max: 300 } as const;
export const BATH_L = { min: 20, max: 400 } as const;

const litres = (what: string, { min, max }: { min: number; max: number }) =>
  z
    .string()
    .trim()
    .min(1, `Enter the litres per ${what}.`)
    .transform((s) => Number(s.replace(',', '.')))
    .pipe(
      z
        .number({ error: `Enter the litres per ${what} as a number, such as ${min * 4}.` })
        .min(min, `A ${what} uses at least ${min} litres here.`)
        .max(max, `A ${what} uses at most ${max} litres here.`),
    );

export const assumptionsSchema = z.object({ showerL: litres('shower', SHOWER_L), bathL: litres('bath', BATH_L) });

export type AssumptionsTyped = z.input<typeof assumptionsSchema>;
