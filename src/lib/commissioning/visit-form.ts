// What a service visit must hold. Shared by the visit form and POST /api/visits.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { visitKinds } from './visit-kinds';

export { visitKindLabels } from './visit-kinds';

const blank = (v: unknown) => (v === '' || v === null ? undefined : typeof v === 'string' ? Number(v) : v);
const reading = (field: string, unit: string, min: number, max: number) =>
  z.preprocess(
    blank,
    z
      .number({ error: `Enter the ${field} as a number (${unit}).` })
      .min(min, `The ${field} must be at least ${min} ${unit}.`)
      .max(max, `The ${field} must be at most ${max} ${unit}.`)
      .optional(),
  );

export const visitSchema = z.object({
  tankId: z.string(messages('Say which tank was visited.')).uuid('Say which tank was visited.'),
  kind: z.enum(visitKinds, { error: 'Choose the kind of visit.' }),
  visitedAt: z.coerce
    .date({ error: 'Enter the date of the visit.' })
    .refine((d) => d.getTime() <= Date.now() + 86_400_000, 'The visit date cannot be in the future.'),
  findings: z
    .string(messages('Describe what was found and done.'))
    .trim()
    .min(3, 'Describe what was found and done.')
    .max(5000),
  parts: z
    .array(
      z.object({
        name: z.string().trim().min(1, 'Name the part.').max(120),
        quantity: z.coerce.number().int('Whole numbers of parts.').min(1, 'At least one.').max(999),
      }),
    )
    .max(50)
    .default([]),
  readings: z
    .object({
      topC: reading('top temperature', '°C', -10, 105),
      bottomC: reading('bottom temperature', '°C', -10, 105),
      inletPressureBar: reading('incoming pressure', 'bar', 0, 16),
      vesselPrechargeBar: reading('expansion vessel pre-charge', 'bar', 0, 10),
      reliefValveTested: z.boolean().optional(),
      dischargeChecked: z.boolean().optional(),
    })
    .default({}),
  /** The tank's open alerts this visit dealt with: they are resolved with it. */
  resolvedAlertIds: z.array(z.string().uuid('Unknown alert.')).max(50).default([]),
  uploadIds: z.array(z.string().uuid('Unknown photo.')).max(30).default([]),
});
export type VisitInput = z.infer<typeof visitSchema>;

const readingFields = visitSchema.shape.readings.unwrap().shape;

/**
 * The visit form as typed: the visit's own fields checked by the same schemas as the API's, with
 * the readings flat and the parts as lines of text ("2 × anode").
 */
export const visitFormSchema = visitSchema.pick({ kind: true, visitedAt: true, findings: true }).extend({
  parts: z.string().max(10_000, 'At most 10,000 characters of parts.').optional(),
  topC: readingFields.topC,
  bottomC: readingFields.bottomC,
  inletPressureBar: readingFields.inletPressureBar,
  vesselPrechargeBar: readingFields.vesselPrechargeBar,
  reliefValveTested: readingFields.reliefValveTested,
  dischargeChecked: readingFields.dischargeChecked,
});
export type VisitFormValues = z.input<typeof visitFormSchema> & Record<string, unknown>;

/** "2 × anode" (or "2 x anode") is two anodes; a line without a count is one part. */
export function partsOf(text: string | undefined): { quantity: number; name: string }[] {
  return String(text ?? '')
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => {
      const m = l.match(/^(\d+)\s*[x×]\s*(.+)$/i);
      return m ? { quantity: Number(m[1]), name: m[2]! } : { quantity: 1, name: l };
    });
}

/** The body of POST /api/visits from the form's values (raw, as typed: the API checks them again). */
export function visitBody(
  v: VisitFormValues,
  extra: { tankId: string; resolvedAlertIds: string[]; uploadIds: string[] },
): Record<string, unknown> {
  return {
    tankId: extra.tankId,
    kind: v.kind,
    visitedAt: v.visitedAt,
    findings: v.findings ?? '',
    parts: partsOf(v.parts),
    readings: {
      topC: v.topC,
      bottomC: v.bottomC,
      inletPressureBar: v.inletPressureBar,
      vesselPrechargeBar: v.vesselPrechargeBar,
      reliefValveTested: v.reliefValveTested === true,
      dischargeChecked: v.dischargeChecked === true,
    },
    resolvedAlertIds: extra.resolvedAlertIds,
    uploadIds: extra.uploadIds,
  };
}
