// Commands to a tank (the telemetry pipeline's endpoint): list with polling, and sending one.
import { queryOptions } from '@tanstack/react-query';
import { fetchJson } from './client';

export interface CommandView {
  id: string;
  kind: string;
  state: string;
  createdAt: string | null;
  appliedAt: string | null;
  detail: string | null;
  params: Record<string, unknown>;
}

type Raw = Record<string, unknown>;
const str = (v: unknown): string | null => (typeof v === 'string' ? v : null);

/** One command from the endpoint's answer, whichever envelope it uses. */
function toCommandView(raw: Raw): CommandView {
  const c = (raw.command && typeof raw.command === 'object' && 'id' in (raw.command as Raw) ? raw.command : raw) as Raw;
  return {
    id: String(c.id ?? ''),
    kind: String(c.kind ?? ''),
    state: String(c.state ?? 'queued'),
    createdAt: str(c.createdAt),
    appliedAt: str(c.appliedAt),
    detail: str(c.detail),
    params: (c.params && typeof c.params === 'object' ? c.params : {}) as Record<string, unknown>,
  };
}

function commandList(body: unknown): CommandView[] {
  const arr = Array.isArray(body)
    ? body
    : body && typeof body === 'object'
      ? ((body as Raw).items ?? (body as Raw).commands)
      : null;
  return Array.isArray(arr) ? arr.map((x) => toCommandView(x as Raw)) : [];
}

export const isSettled = (state: string) => ['applied', 'rejected', 'failed'].includes(state);

/** Polls quickly while a command is still on its way, slowly otherwise. */
export const commandsQuery = (tankId: string) =>
  queryOptions({
    queryKey: ['tanks', tankId, 'commands'],
    queryFn: async () => commandList(await fetchJson<unknown>(`/api/tanks/${tankId}/commands`)),
    refetchInterval: (q) => (q.state.data?.some((c) => !isSettled(c.state)) ? 2_000 : 15_000),
  });

export async function sendCommand(tankId: string, command: Record<string, unknown>): Promise<CommandView> {
  return toCommandView(
    await fetchJson<Raw>(`/api/tanks/${tankId}/commands`, { method: 'POST', body: JSON.stringify(command) }),
  );
}
