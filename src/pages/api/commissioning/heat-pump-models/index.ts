import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { createHeatPumpModel, listHeatPumpModels } from '../../../../db/queries/commissioning';
import { HttpError, requireViewer } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** The heat-pump models the company fits, with their sensor inputs' NTC curves. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals);
  return json({ models: await listHeatPumpModels(viewer.companyId) });
});

const num = (field: string, unit: string, min: number, max: number) =>
  z.coerce
    .number({ error: `Enter the ${field} as a number (${unit}).` })
    .min(min, `The ${field} must be at least ${min} ${unit}.`)
    .max(max, `The ${field} must be at most ${max} ${unit}.`);

export const heatPumpModelSchema = z.object({
  name: z.string(messages('Enter the model’s name.')).trim().min(1, 'Enter the model’s name.').max(120),
  outputW: num('output', 'W', 500, 50000).int('Enter the output in whole watts.'),
  ntcR25Ohm: num('sensor input’s resistance at 25 °C', 'Ω', 100, 1_000_000),
  ntcBetaK: num('sensor input’s B value', 'K', 2000, 6000),
});

/** Adds a model (admins): { name, outputW, ntcR25Ohm, ntcBetaK }. */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  const input = await jsonBody(request, heatPumpModelSchema);
  const model = await createHeatPumpModel(viewer.companyId, viewer.userId, input);
  if (!model)
    throw new HttpError(409, 'ModelExists', `Your company already lists a model called “${input.name}”.`, [
      { field: 'name', message: 'Already listed.' },
    ]);
  return json({ model }, 201);
});
