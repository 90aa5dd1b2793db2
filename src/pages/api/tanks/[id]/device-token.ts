import { findTankInScope } from '../../../../db/queries/telemetry';
import { requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { rotateDeviceToken } from '../../../../lib/telemetry/commands.server';
import { topicFor } from '../../../../lib/telemetry/wire';

/**
 * POST /api/tanks/{id}/device-token (admins): issues a new device token, returned once and
 * stored only as a hash. The previous token stops working.
 */
export const POST = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin']);
  const tank = await requireTank(findTankInScope, scopeOf(viewer), params.id);
  const { token, issuedAt } = await rotateDeviceToken({ tank, actorUserId: viewer.userId });
  return json(
    {
      serial: tank.serial,
      token,
      issuedAt: issuedAt.toISOString(),
      notice:
        "This token is shown only once. Enter it in the tank's controller now; the previous token no longer works.",
      mqtt: {
        username: tank.serial,
        telemetryTopic: topicFor(tank.serial, 'telemetry'),
        commandTopic: topicFor(tank.serial, 'commands'),
        statusTopic: topicFor(tank.serial, 'status'),
      },
    },
    201,
  );
});
