// The commissioning wizard's steps and what each must hold. Pure: shared by the wizard (to show
// field errors before saving) and the endpoints (which trust nothing the browser sends).
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { SERIAL_PATTERN } from '../telemetry/wire';
import { capabilities, hasHeatPump, heatSourceDescriptions, heatSourceKinds, type HeatSource } from '../heat-sources';

export const stepIds = [
  'home',
  'cylinder',
  'heat_source',
  'target',
  'controls',
  'connection',
  'safety',
  'photos',
  'signoff',
] as const;
export type StepId = (typeof stepIds)[number];

export const stepTitles: Record<StepId, string> = {
  home: 'Home and householder',
  cylinder: 'Cylinder',
  heat_source: 'Heat source and sensor input',
  target: 'Target temperature',
  controls: 'Programmer and thermostat',
  connection: 'Connection check',
  safety: 'Safety checklist',
  photos: 'Photos and documents',
  signoff: 'Sign-off and handover',
};

const text = (field: string, max = 200) =>
  z
    .string(messages(`Enter the ${field}.`, `Enter the ${field}.`))
    .trim()
    .min(1, `Enter the ${field}.`)
    .max(max, `The ${field} can be at most ${max} characters.`);
const optionalText = (max = 200) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters.`)
    .transform((v) => (v ? v : undefined))
    .optional();
/** Empty form fields are "not given"; numbers typed as text are read as numbers. */
const blankToUndefined = (v: unknown) =>
  v === '' || v === null ? undefined : typeof v === 'string' ? Number(v.trim().replace(',', '.')) : v;
function numberSchema(field: string, unit: string, min: number, max: number, int: boolean) {
  let n = z.number(messages(`Enter the ${field} (${unit}).`, `Enter the ${field} as a number (${unit}).`));
  if (int) n = n.int(`The ${field} must be a whole number (${unit}).`);
  return n
    .min(min, `The ${field} must be at least ${min} ${unit}.`)
    .max(max, `The ${field} must be at most ${max} ${unit}.`);
}
const number = (field: string, unit: string, min: number, max: number, int = false) =>
  z.preprocess(blankToUndefined, numberSchema(field, unit, min, max, int));
const optionalNumber = (field: string, unit: string, min: number, max: number, int = false) =>
  z.preprocess(blankToUndefined, numberSchema(field, unit, min, max, int).optional());

const homeStepSchema = z.object({
  addressLine: text('address'),
  town: text('town', 80),
  postcode: text('postcode', 12),
  occupants: number('number of occupants', 'people', 1, 20, true),
  contactName: text('householder’s name', 120),
  contactEmail: z
    .string(messages('Enter the householder’s e-mail address.'))
    .trim()
    .toLowerCase()
    .email('Enter the householder’s e-mail address (name@example.com).')
    .max(254),
  contactPhone: optionalText(40),
});
export type HomeStep = z.infer<typeof homeStepSchema>;

export const exchangers = ['coil', 'plate_ports', 'none'] as const;
export type Exchanger = (typeof exchangers)[number];
export const exchangerLabels: Record<Exchanger, string> = {
  coil: 'Internal coil',
  plate_ports: 'Ports for an external plate heat exchanger',
  none: 'None (electric only)',
};

/** "0.1, 0.3, …" → heights in metres, bottom to top; empty means evenly spaced. */
const sensorHeights = z
  .union([z.string(), z.array(z.coerce.number())])
  .optional()
  .transform((v, ctx) => {
    if (v === undefined || (typeof v === 'string' && v.trim() === '')) return undefined;
    const list =
      typeof v === 'string'
        ? v
            .split(/[,;\s]+/)
            .filter(Boolean)
            .map(Number)
        : v;
    if (list.some((h) => !Number.isFinite(h) || h < 0)) {
      ctx.addIssue({
        code: 'custom',
        message: 'Give each sensor height in metres above the tank bottom, separated by commas (e.g. 0.1, 0.25, 0.4).',
      });
      return z.NEVER;
    }
    return list;
  })
  .optional();

export const cylinderStepSchema = z
  .object({
    serial: z
      .string(messages('Enter the cylinder’s serial number, or scan its code.'))
      .trim()
      .min(1, 'Enter the cylinder’s serial number, or scan its code.')
      .regex(
        SERIAL_PATTERN,
        'A serial has letters, digits, dots, dashes or underscores only (at most 64), starting with a letter or digit.',
      ),
    model: text('cylinder model', 80),
    volumeL: number('volume', 'litres', 30, 2000, true),
    heightM: number('height', 'm', 0.3, 4),
    sensorCount: number('number of sensors', 'sensors', 1, 64, true),
    sensorHeightsM: sensorHeights,
    exchanger: z.enum(exchangers, { error: 'Choose the cylinder’s heat exchanger.' }),
    immersionW: number('immersion rating', 'W', 0, 12000, true),
    declaredLossW: optionalNumber('declared standing loss', 'W', 0, 500),
  })
  .superRefine((c, ctx) => {
    const h = c.sensorHeightsM;
    if (!h) return;
    if (h.length !== c.sensorCount)
      ctx.addIssue({
        code: 'custom',
        path: ['sensorHeightsM'],
        message: `Give ${c.sensorCount} heights, one per sensor (${h.length} given), or leave this empty for evenly spaced sensors.`,
      });
    else if (h.some((x, i) => i > 0 && x <= h[i - 1]))
      ctx.addIssue({
        code: 'custom',
        path: ['sensorHeightsM'],
        message: 'List the sensor heights bottom to top, each higher than the one before.',
      });
    else if (h[h.length - 1] > c.heightM)
      ctx.addIssue({
        code: 'custom',
        path: ['sensorHeightsM'],
        message: `The top sensor (${h[h.length - 1]} m) cannot be above the top of a ${c.heightM} m cylinder.`,
      });
  });
export type CylinderStep = z.infer<typeof cylinderStepSchema>;

export const heatSourceStepSchema = z
  .object({
    heatSource: z.enum(heatSourceKinds, { error: 'Choose the heat source.' }),
    heatPumpModelId: z.preprocess(
      (v) => (v === '' ? undefined : v),
      z.string().uuid('Choose a heat-pump model from the list.').optional(),
    ),
    heatPumpName: optionalText(120),
    hpOutputW: optionalNumber('heat pump output', 'W', 0, 50000, true),
    ntcR25Ohm: optionalNumber('sensor input’s resistance at 25 °C', 'Ω', 100, 1_000_000),
    ntcBetaK: optionalNumber('sensor input’s B value', 'K', 2000, 6000),
    callC: optionalNumber('call-for-heat temperature', '°C', -20, 80),
    satisfiedC: optionalNumber('satisfied temperature', '°C', -20, 90),
  })
  .superRefine((s, ctx) => {
    if (!hasHeatPump(s.heatSource)) return;
    const need = (key: keyof typeof s, message: string) => {
      if (s[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], message });
    };
    need('hpOutputW', 'Enter the heat pump’s output in W.');
    need(
      'ntcR25Ohm',
      'Enter the resistance of the heat pump’s hot-water sensor input at 25 °C (Ω), or choose its model.',
    );
    need('ntcBetaK', 'Enter the B value of the heat pump’s hot-water sensor input (K), or choose its model.');
    need('callC', 'Enter the temperature the heat pump should read when the cylinder calls for heat.');
    need('satisfiedC', 'Enter the temperature the heat pump should read when the cylinder is satisfied.');
    if (s.callC !== undefined && s.satisfiedC !== undefined && s.callC >= s.satisfiedC) {
      ctx.addIssue({
        code: 'custom',
        path: ['callC'],
        message: `The call-for-heat temperature (${s.callC} °C) must be below the satisfied temperature (${s.satisfiedC} °C).`,
      });
    }
  });
export type HeatSourceStep = z.infer<typeof heatSourceStepSchema>;

/** HSE HSG274 Part 2 (2014): store hot water at 60 °C or above. */
export const LEGIONELLA_STORE_C = 60;

const targetStepSchema = z
  .object({
    targetC: number('target temperature', '°C', 40, 75),
    hysteresisK: number('reheat differential', 'K', 1, 20),
    /** Needed below 60 °C: how stored water is pasteurised instead. */
    belowSixtyPlan: optionalText(300),
  })
  .superRefine((t, ctx) => {
    if (t.targetC < LEGIONELLA_STORE_C && !t.belowSixtyPlan) {
      ctx.addIssue({
        code: 'custom',
        path: ['belowSixtyPlan'],
        message: `Below ${LEGIONELLA_STORE_C} °C, say how the stored water is regularly raised to ${LEGIONELLA_STORE_C} °C or above (e.g. a weekly immersion cycle).`,
      });
    }
  });
export type TargetStep = z.infer<typeof targetStepSchema>;

export const controlsStepSchema = z.object({
  externalControl: z.enum(['none', 'programmer', 'thermostat', 'both'], {
    error: 'Say whether an external programmer or thermostat is wired in.',
  }),
  controlNotes: optionalText(300),
});
export type ControlsStep = z.infer<typeof controlsStepSchema>;

// Nothing typed here: the server checks the connection itself. Unknown keys are dropped, not stored.
const connectionStepSchema = z.object({});

export const safetyItems = [
  {
    id: 'expansion',
    label: 'Expansion provision fitted and charged to the manufacturer’s pressure (vessel or air gap)',
  },
  { id: 'reliefValve', label: 'Temperature and pressure relief valve fitted and manually tested' },
  { id: 'discharge', label: 'Discharge pipe and tundish installed, visible and run to a safe place' },
  { id: 'reducingValve', label: 'Pressure reducing valve fitted and set to the cylinder’s working pressure' },
  { id: 'isolation', label: 'Electrical isolation of the immersion and controls in place and tested' },
] as const;
export type SafetyItemId = (typeof safetyItems)[number]['id'];

const tick = (label: string) => z.literal(true, { error: `Check and tick: ${label}.` });
const safetyStepSchema = z.object({
  ...(Object.fromEntries(safetyItems.map((i) => [i.id, tick(i.label)])) as Record<SafetyItemId, z.ZodLiteral<true>>),
  competentPerson: z.literal(true, {
    error: 'Confirm that the work was done by a competent, licensed person under local building regulations.',
  }),
  registrationNumber: optionalText(60),
});
export type SafetyStep = z.infer<typeof safetyStepSchema>;

// Photos are uploads (POST /api/uploads); the step itself holds nothing.
const photosStepSchema = z.object({});

const signoffStepSchema = z.object({
  householderEmail: z
    .string(messages('Enter the e-mail address to send the invitation and record to.'))
    .trim()
    .toLowerCase()
    .email('Enter the e-mail address to send the invitation and record to (name@example.com).'),
  notes: optionalText(1000),
});
export type SignoffStep = z.infer<typeof signoffStepSchema>;

export const stepSchemas = {
  home: homeStepSchema,
  cylinder: cylinderStepSchema,
  heat_source: heatSourceStepSchema,
  target: targetStepSchema,
  controls: controlsStepSchema,
  connection: connectionStepSchema,
  safety: safetyStepSchema,
  photos: photosStepSchema,
  signoff: signoffStepSchema,
} satisfies Record<StepId, z.ZodTypeAny>;

/** The fields of every step, typed, once all have been validated. */
export interface CommissioningAnswers {
  home: HomeStep;
  cylinder: CylinderStep;
  heat_source: HeatSourceStep;
  target: TargetStep;
  controls: ControlsStep;
  safety: SafetyStep;
  signoff: SignoffStep;
}

export interface FieldProblem {
  field: string;
  message: string;
}

/** The problems of one step's answers, each field named as `step.field`. */
export function stepProblems(step: StepId, value: unknown): FieldProblem[] {
  const r = stepSchemas[step].safeParse(value ?? {});
  return r.success
    ? []
    : r.error.issues.map((i) => ({ field: `${step}.${i.path.join('.') || '(step)'}`, message: i.message }));
}

/** Which sources a cylinder's exchanger can take: a coil for a coil source, ports for a plate exchanger. */
export function exchangerProblem(exchanger: Exchanger, source: HeatSource): string | null {
  const need = capabilities(source).exchanger;
  if (need === null || exchanger === need) return null;
  const what = need === 'coil' ? 'an internal coil' : 'ports for a plate heat exchanger';
  return `${heatSourceDescriptions[source]} needs a cylinder with ${what} (this one has: ${exchangerLabels[exchanger].toLowerCase()}).`;
}

/** Steps whose answers the cylinder's registration (connection check) needs. */
export const registrationSteps: StepId[] = ['home', 'cylinder', 'heat_source', 'target'];

/**
 * Validates the draft's answers for the given steps together (each step, then the cross-checks),
 * returning the typed answers or every problem.
 */
export function validateAnswers(
  data: Record<string, unknown>,
  steps: readonly StepId[],
): { ok: true; answers: Partial<CommissioningAnswers> } | { ok: false; problems: FieldProblem[] } {
  const problems: FieldProblem[] = [];
  const answers: Record<string, unknown> = {};
  for (const step of steps) {
    const r = stepSchemas[step].safeParse(data[step] ?? {});
    if (r.success) answers[step] = r.data;
    else
      problems.push(
        ...r.error.issues.map((i) => ({ field: `${step}.${i.path.join('.') || '(step)'}`, message: i.message })),
      );
  }
  const cyl = answers.cylinder as CylinderStep | undefined;
  const src = answers.heat_source as HeatSourceStep | undefined;
  if (cyl && src) {
    const p = exchangerProblem(cyl.exchanger, src.heatSource);
    if (p) problems.push({ field: 'heat_source.heatSource', message: p });
  }
  return problems.length ? { ok: false, problems } : { ok: true, answers: answers as Partial<CommissioningAnswers> };
}
