// What staff may set on a home: its cold-inlet temperature, which every figure of its tanks counts
// from (state of charge, V40, stored heat). Without one the figures use EN 16147's 10 °C.
import { z } from '@/lib/zod';

/**
 * Cold mains water arrives at roughly 4–20 °C through the year in temperate climates (from memory);
 * 1–25 °C refuses a slip of the keyboard (a delivery temperature typed in) without refusing a real supply.
 */
export const COLD_INLET_MIN_C = 1;
export const COLD_INLET_MAX_C = 25;

export const homeSettingsBody = z
  .object({
    coldInletC: z
      .number({ message: 'must be a number of °C, or null for EN 16147’s 10 °C' })
      .finite()
      .min(COLD_INLET_MIN_C, `must be at least ${COLD_INLET_MIN_C} °C`)
      .max(COLD_INLET_MAX_C, `must be at most ${COLD_INLET_MAX_C} °C`)
      .nullable(),
  })
  .strict();
export type HomeSettingsBody = z.infer<typeof homeSettingsBody>;
