// Commands sent to tanks and the replies that move them along: queued → sent → acknowledged → applied.
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { db } from '..';
import { commands, tanks, type CommandRow, type CommandState } from '../schema';
import type { CommandReply, CommandRequest } from '../../lib/telemetry/wire';

export async function insertCommand(input: {
  tankId: string;
  request: CommandRequest;
  createdBy: string | null;
  expiresAt: Date;
}): Promise<CommandRow> {
  const { kind, ...params } = input.request;
  const [row] = await db()
    .insert(commands)
    .values({
      tankId: input.tankId,
      kind,
      params,
      createdBy: input.createdBy,
      expiresAt: input.expiresAt,
    })
    .returning();
  return row;
}

export async function markCommandSent(tankId: string, id: string): Promise<void> {
  await db()
    .update(commands)
    .set({ state: 'sent', sentAt: new Date() })
    .where(and(eq(commands.tankId, tankId), eq(commands.id, id), eq(commands.state, 'queued')));
}

export async function markCommandFailed(tankId: string, id: string, detail: string): Promise<void> {
  await db()
    .update(commands)
    .set({ state: 'failed', detail })
    .where(and(eq(commands.tankId, tankId), eq(commands.id, id), inArray(commands.state, ['queued'])));
}

export async function listCommands(tankId: string, limit = 50): Promise<CommandRow[]> {
  return db().select().from(commands).where(eq(commands.tankId, tankId)).orderBy(desc(commands.createdAt)).limit(limit);
}

export async function getCommand(tankId: string, id: string): Promise<CommandRow | null> {
  const [row] = await db()
    .select()
    .from(commands)
    .where(and(eq(commands.tankId, tankId), eq(commands.id, id)))
    .limit(1);
  return row ?? null;
}

/** States a reply may move a command from: never backwards, never out of a final state. */
const fromStates: Record<CommandReply['state'], CommandState[]> = {
  acknowledged: ['queued', 'sent'],
  applied: ['queued', 'sent', 'acknowledged'],
  rejected: ['queued', 'sent', 'acknowledged'],
};

/**
 * Applies a device's reply. When a new target is applied, the tank's record follows, so the
 * product shows what the tank now does. Returns the updated command, or null when the reply
 * named no command of this tank or would move it backwards (a replayed reply).
 */
export async function recordCommandReply(
  tankId: string,
  reply: CommandReply,
  receivedAt: Date,
): Promise<CommandRow | null> {
  return db().transaction(async (tx) => {
    const at = reply.at ? new Date(reply.at) : receivedAt;
    const set: Partial<typeof commands.$inferInsert> = { state: reply.state };
    if (reply.state === 'acknowledged') set.acknowledgedAt = at;
    if (reply.state === 'applied') {
      set.appliedAt = at;
      set.acknowledgedAt =
        sql`coalesce(${commands.acknowledgedAt}, ${at.toISOString()}::timestamptz)` as unknown as Date;
    }
    if (reply.state === 'rejected') set.detail = reply.detail ?? 'The tank rejected the command.';
    const [row] = await tx
      .update(commands)
      .set(set)
      .where(
        and(
          eq(commands.tankId, tankId),
          eq(commands.id, reply.commandId),
          inArray(commands.state, fromStates[reply.state]),
        ),
      )
      .returning();
    if (!row) return null;
    if (row.state === 'applied' && row.kind === 'set_target') {
      const p = row.params as { targetC: number; hysteresisK?: number };
      await tx
        .update(tanks)
        .set({ targetC: p.targetC, ...(p.hysteresisK ? { hysteresisK: p.hysteresisK } : {}) })
        .where(eq(tanks.id, tankId));
    }
    return row;
  });
}
