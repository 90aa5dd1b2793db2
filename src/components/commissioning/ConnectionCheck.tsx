import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { ApiError, fetchJson } from '../../lib/query/client';
import { LayerColumn } from './LayerColumn';
import { Problem } from '../ui/States';

interface Registration {
  tankId: string;
  serial: string;
  token: string;
  notice: string;
  mqtt: { username: string; telemetryTopic: string };
}
type Connection =
  | { registered: false }
  | {
      registered: true;
      tankId: string;
      received: boolean;
      telemetry: { ts: string; layersC: (number | null)[]; v40L: number | null } | null;
    };

/** Registers the cylinder, shows its device token once, then waits live for its first telemetry. */
export function ConnectionCheck({ id, onReceived }: { id: string; onReceived: (received: boolean) => void }) {
  const [registration, setRegistration] = useState<Registration | null>(null);
  const [problem, setProblem] = useState<ApiError | null>(null);
  const [busy, setBusy] = useState(false);
  const q = useQuery({
    queryKey: ['commissioning', id, 'connection'],
    queryFn: async () => {
      const c = await fetchJson<Connection>(`/api/commissioning/${id}/connection`);
      onReceived(c.registered && c.received);
      return c;
    },
    // Poll every two seconds until the first reading is in.
    refetchInterval: (query) => (query.state.data?.registered && query.state.data.received ? false : 2000),
  });

  async function register() {
    setBusy(true);
    setProblem(null);
    try {
      setRegistration(
        await fetchJson<Registration>(`/api/commissioning/${id}/registration`, { method: 'POST', body: '{}' }),
      );
      await q.refetch();
    } catch (err) {
      setProblem(
        err instanceof ApiError
          ? err
          : new ApiError(0, 'Network', 'Could not reach Heatlayer. Check the connection and try again.'),
      );
    } finally {
      setBusy(false);
    }
  }

  const c = q.data;
  return (
    <div className="space-y-4">
      {problem && <Problem message={problem.message} fields={problem.fields} />}
      {c && !c.registered && (
        <div className="space-y-2">
          <p className="text-sm text-ink-soft">
            Registering creates the home and the cylinder in Heatlayer and issues the cylinder’s device token. Enter the
            token in the cylinder’s controller; Heatlayer then waits for its first reading.
          </p>
          <button type="button" className="btn-primary" onClick={register} disabled={busy}>
            {busy ? 'Registering…' : 'Register the cylinder and issue its token'}
          </button>
        </div>
      )}
      {registration && (
        <div
          className="rounded-card border border-dusk bg-dusk-pale p-4 text-sm"
          data-device-token={registration.token}
        >
          <p className="font-semibold">Device token for {registration.serial}</p>
          <p className="figure mt-1 break-all text-base">{registration.token}</p>
          <p className="mt-2 text-ink-soft">
            {registration.notice} MQTT: user name <span className="figure">{registration.mqtt.username}</span>, topic{' '}
            <span className="figure">{registration.mqtt.telemetryTopic}</span>. HTTP gateways post to{' '}
            <span className="figure">/api/ingest</span> with the token as a Bearer token.
          </p>
        </div>
      )}
      {c?.registered && !c.received && (
        <div
          role="status"
          aria-live="polite"
          className="flex items-center gap-3 rounded-card border border-dashed border-line-strong p-4 text-sm"
        >
          <span aria-hidden="true" className="h-3 w-3 animate-pulse rounded-full bg-tide" />
          Waiting for the first reading from the cylinder…
          {!registration && (
            <button type="button" className="btn-quiet ml-auto" onClick={register} disabled={busy}>
              Issue a new token
            </button>
          )}
        </div>
      )}
      {c?.registered && c.received && c.telemetry && (
        <div role="status" aria-live="polite" className="flex flex-wrap items-start gap-6" data-connection="received">
          <LayerColumn
            layersC={c.telemetry.layersC}
            label={`First telemetry, ${new Date(c.telemetry.ts).toLocaleTimeString('en-GB')}`}
          />
          <div className="text-sm">
            <p className="font-semibold text-tide-deep">Connected: the cylinder is reporting.</p>
            <p className="mt-1 text-ink-soft">
              {c.telemetry.layersC.length} layers received
              {c.telemetry.v40L !== null
                ? `, about ${Math.round(c.telemetry.v40L)} L of water at 40 °C available now`
                : ''}
              . Check that the bottom reads coolest and the top hottest: a reversed column means the sensor string is
              fitted upside down.
            </p>
          </div>
        </div>
      )}
      {q.isError && <Problem message={(q.error as Error).message} />}
    </div>
  );
}
