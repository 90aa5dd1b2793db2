// Commands to tanks: recorded, published on the tank's command topic, then moved along by the
// device's replies (handled by the ingest worker). Also device-token rotation, the other
// staff action that reaches the broker.
import { db } from '../../db';
import { recordAudit } from '../../db/queries/audit';
import { getCommand, insertCommand, markCommandFailed, markCommandSent } from '../../db/queries/commands';
import { setDeviceTokenHash } from '../../db/queries/telemetry';
import type { CommandRow } from '../../db/schema';
import { HttpError } from '../server/authz';
import { generateDeviceToken, hashDeviceToken } from './device-token';
import { publishAsService } from './service-client.server';
import { CREDENTIALS_ROTATED_TOPIC, topicFor, type CommandMessage, type CommandRequest } from './wire';

/** A command not received by then is dropped by the device (it would surprise people hours later). */
const COMMAND_TTL_MS = 60 * 60_000;

/** HSE HSG274 Part 2 (2014): store hot water at 60 °C or above. */
const LEGIONELLA_STORE_C = 60;

export interface TankRef {
  id: string;
  serial: string;
  companyId: string;
}

export interface SentCommand {
  command: CommandRow;
  warnings: string[];
}

export async function sendCommand(input: {
  tank: TankRef;
  request: CommandRequest;
  actorUserId: string | null;
}): Promise<SentCommand> {
  const now = Date.now();
  const row = await insertCommand({
    tankId: input.tank.id,
    request: input.request,
    createdBy: input.actorUserId,
    expiresAt: new Date(now + COMMAND_TTL_MS),
  });
  const message: CommandMessage = {
    id: row.id,
    issuedAt: now,
    expiresAt: now + COMMAND_TTL_MS,
    command: input.request,
  };
  try {
    await publishAsService(topicFor(input.tank.serial, 'commands'), JSON.stringify(message));
  } catch (err) {
    const detail = `Could not hand the command to the broker: ${err instanceof Error ? err.message : String(err)}`;
    await markCommandFailed(input.tank.id, row.id, detail);
    throw new HttpError(
      503,
      'BrokerUnavailable',
      'The command could not be sent to the tank just now (the message broker did not answer). It was recorded as failed; try again in a minute.',
    );
  }
  await markCommandSent(input.tank.id, row.id);
  await recordAudit({
    companyId: input.tank.companyId,
    actorUserId: input.actorUserId,
    action: 'command.sent',
    subject: `tank:${input.tank.id}`,
    detail: { commandId: row.id, kind: input.request.kind },
  });
  const warnings: string[] = [];
  if (input.request.kind === 'set_target' && input.request.targetC < LEGIONELLA_STORE_C) {
    warnings.push(
      `A target below ${LEGIONELLA_STORE_C} °C does not keep stored water at the temperature HSE HSG274 Part 2 asks for legionella control; make sure a regular pasteurisation cycle is scheduled, and follow local codes.`,
    );
  }
  return { command: (await getCommand(input.tank.id, row.id)) ?? row, warnings };
}

/**
 * Issues a new device token for a tank: stored only as its hash, returned once. The old token
 * stops working at once for HTTP and for new MQTT logins, and the broker ends the sessions that
 * used it (best effort: if the broker cannot be told, those sessions last until they reconnect).
 */
export async function rotateDeviceToken(input: {
  tank: TankRef;
  actorUserId: string;
}): Promise<{ token: string; issuedAt: Date }> {
  const token = generateDeviceToken();
  const issuedAt = await db().transaction(async (tx) => {
    const at = await setDeviceTokenHash(input.tank.id, hashDeviceToken(token), tx);
    await recordAudit(
      {
        companyId: input.tank.companyId,
        actorUserId: input.actorUserId,
        action: 'device_token.rotated',
        subject: `tank:${input.tank.id}`,
        detail: { serial: input.tank.serial },
      },
      tx,
    );
    return at;
  });
  await publishAsService(CREDENTIALS_ROTATED_TOPIC, input.tank.serial).catch((err) => {
    console.error(
      `[mqtt] could not tell the broker that ${input.tank.serial}'s token was rotated:`,
      err instanceof Error ? err.message : err,
    );
  });
  return { token, issuedAt };
}
