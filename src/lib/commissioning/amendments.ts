// What may change on a signed commissioning record. Each change is an amendment kept beside the
// signed original (who, when, from what, to what, why); a change that the tank itself runs on
// (its target, for instance) is applied to the tank as well.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { controlsStepSchema, LEGIONELLA_STORE_C } from './steps';

export interface AmendableField {
  label: string;
  schema: z.ZodTypeAny;
  /** The tanks column that follows this field, if any. */
  tankColumn?: 'targetC' | 'hysteresisK' | 'declaredLossW';
}

export const amendableFields = {
  'target.targetC': {
    label: 'Target temperature (°C)',
    schema: z.coerce.number().min(40, 'At least 40 °C.').max(75, 'At most 75 °C.'),
    tankColumn: 'targetC',
  },
  'target.hysteresisK': {
    label: 'Reheat differential (K)',
    schema: z.coerce.number().min(1, 'At least 1 K.').max(20, 'At most 20 K.'),
    tankColumn: 'hysteresisK',
  },
  'target.belowSixtyPlan': {
    label: `Pasteurisation plan below ${LEGIONELLA_STORE_C} °C`,
    schema: z.string().trim().min(1, 'Describe the plan.').max(300),
  },
  'cylinder.declaredLossW': {
    label: 'Declared standing loss (W)',
    schema: z.coerce.number().min(0).max(500),
    tankColumn: 'declaredLossW',
  },
  'controls.externalControl': {
    label: 'External programmer or thermostat',
    schema: controlsStepSchema.shape.externalControl,
  },
  'controls.controlNotes': { label: 'Notes on the controls', schema: z.string().trim().max(300) },
  'home.contactPhone': { label: 'Householder’s telephone', schema: z.string().trim().max(40) },
  'signoff.notes': { label: 'Notes', schema: z.string().trim().max(1000) },
} satisfies Record<string, AmendableField>;
export type AmendableFieldId = keyof typeof amendableFields;

export const amendmentSchema = z.object({
  field: z.enum(Object.keys(amendableFields) as [AmendableFieldId, ...AmendableFieldId[]], {
    error: `Choose a field that may be amended: ${Object.keys(amendableFields).join(', ')}.`,
  }),
  value: z.unknown(),
  reason: z
    .string(messages('Say why the record is being amended.'))
    .trim()
    .min(3, 'Say why the record is being amended.')
    .max(500),
});

/** Reads `step.field` out of the answers. */
export function fieldValue(record: Record<string, unknown>, field: string): unknown {
  const [step, key] = field.split('.');
  return (record[step] as Record<string, unknown> | undefined)?.[key];
}

/** The answers with amendments applied in order (the signed original is never changed). */
export function amendedAnswers(
  record: Record<string, unknown>,
  amendments: readonly { field: string; newValue: unknown }[],
): Record<string, unknown> {
  const out: Record<string, unknown> = structuredClone(record);
  for (const a of amendments) {
    const [step, key] = a.field.split('.');
    out[step] = { ...(out[step] as Record<string, unknown> | undefined), [key]: a.newValue };
  }
  return out;
}
