import { listCommands } from '../../../../db/queries/commands';
import { findTankInScope } from '../../../../db/queries/telemetry';
import { HttpError, requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { sendCommand } from '../../../../lib/telemetry/commands.server';
import { commandRequestSchema } from '../../../../lib/telemetry/wire';

/** GET /api/tanks/{id}/commands: the tank's recent commands and how far each got. */
export const GET = endpoint(async ({ locals, params }) => {
  const tank = await requireTank(findTankInScope, scopeOf(requireViewer(locals)), params.id);
  return json({ commands: await listCommands(tank.id) });
});

/**
 * POST /api/tanks/{id}/commands: `{ kind: 'boost', minutes }`, `{ kind: 'set_target', targetC,
 * hysteresisK? }` or `{ kind: 'set_schedule', windows: [{ from, to }] }`. Householders may boost
 * and schedule their own tank; the storage target is for staff (it matters for legionella control).
 */
export const POST = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals);
  const tank = await requireTank(findTankInScope, scopeOf(viewer), params.id);
  const command = await jsonBody(request, commandRequestSchema);
  if (command.kind === 'set_target' && viewer.role === 'householder') {
    throw new HttpError(
      403,
      'NotAllowedForRole',
      'The storage temperature is set by your service company, because it matters for legionella control. You can boost or change the schedule.',
    );
  }
  const sent = await sendCommand({ tank, request: command, actorUserId: viewer.userId });
  return json(sent, 202);
});
