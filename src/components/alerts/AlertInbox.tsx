import { useMutation, useQuery, useQueryClient, keepPreviousData } from '@tanstack/react-query';
import { useState } from 'react';
import { fetchJson, ApiError } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import {
  alertKinds,
  alertLabels,
  alertSeverities,
  severityLabels,
  stateLabels,
  type AlertSeverity,
  type AlertState,
} from '../../lib/alerts/types';
import type { AlertListItem } from '../../db/queries/alerts';
import { Empty, ErrorNotice, Loading } from '../ui/States';
import { cn } from '../ui/cn';

interface Staff {
  id: string;
  name: string | null;
  email: string;
}
interface Props {
  towns: string[];
  staff: Staff[];
  me: string;
  initial: Record<string, string>;
}
interface ListAnswer {
  items: AlertListItem[];
  total: number;
  page: number;
  pageSize: number;
}

const severityTone: Record<AlertSeverity, string> = {
  critical: 'bg-brick text-white',
  warning: 'bg-ochre-pale text-ink border border-ochre',
  info: 'bg-dusk-pale text-dusk border border-dusk',
};
const stateTone: Record<AlertState, string> = {
  open: 'text-brick font-semibold',
  acknowledged: 'text-ink-soft',
  resolved: 'text-tide-deep',
};
const fmt = (iso: string) =>
  `${new Date(iso).toLocaleString('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', timeZone: 'UTC' })} UTC`;
const tankLink = (a: AlertListItem) =>
  `/tanks/${a.tank.id}?from=${new Date(a.evidence.at - 6 * 3_600_000).toISOString()}&to=${new Date(a.evidence.at + 6 * 3_600_000).toISOString()}`;

function Select({
  id,
  label,
  value,
  options,
  onChange,
}: {
  id: string;
  label: string;
  value: string;
  options: [string, string][];
  onChange: (v: string) => void;
}) {
  return (
    <div>
      <label className="label" htmlFor={id}>
        {label}
      </label>
      <select id={id} className="field py-1.5 text-sm" value={value} onChange={(e) => onChange(e.target.value)}>
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </div>
  );
}

function AlertInbox({ towns, staff, me, initial }: Props) {
  const [filters, setFilters] = useState<Record<string, string>>({ state: 'active', ...initial });
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [note, setNote] = useState('');
  const qc = useQueryClient();
  const search = new URLSearchParams(Object.entries(filters).filter(([, v]) => v)).toString();
  const list = useQuery({
    queryKey: ['alerts', filters],
    queryFn: () => fetchJson<ListAnswer>(`/api/alerts?${search}`),
    refetchInterval: 15_000,
    placeholderData: keepPreviousData,
  });
  const set = (k: string, v: string) => {
    const next = { ...filters, [k]: v };
    setFilters(next);
    setSelected(new Set());
    const qs = new URLSearchParams(Object.entries(next).filter(([, x]) => x)).toString();
    window.history.replaceState(null, '', `/alerts${qs ? `?${qs}` : ''}`);
  };
  const done = () => {
    setSelected(new Set());
    setNote('');
    void qc.invalidateQueries({ queryKey: ['alerts'] });
  };
  const ack = useMutation({
    mutationFn: () =>
      fetchJson('/api/alerts/acknowledge', {
        method: 'POST',
        body: JSON.stringify({ ids: [...selected], note: note || undefined }),
      }),
    onSuccess: done,
  });
  const act = useMutation({
    mutationFn: (v: { id: string; body: object }) =>
      fetchJson(`/api/alerts/${v.id}`, { method: 'PATCH', body: JSON.stringify(v.body) }),
    onSuccess: done,
  });
  const items = list.data?.items ?? [];
  const openIds = items.filter((a) => a.state === 'open').map((a) => a.id);
  const error = ack.error ?? act.error;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h1 className="text-2xl font-semibold tracking-tight">Alerts</h1>
        <p className="text-sm text-ink-soft">
          {list.data
            ? `${list.data.total.toLocaleString('en-GB')} ${filters.state === 'resolved' ? 'resolved' : filters.state === 'active' ? 'needing attention' : 'alerts'}`
            : ' '}
        </p>
      </div>
      <form
        className="card grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-6"
        onSubmit={(e) => e.preventDefault()}
        aria-label="Filter alerts"
      >
        <Select
          id="f-state"
          label="State"
          value={filters.state ?? ''}
          onChange={(v) => set('state', v)}
          options={[
            ['active', 'Open or acknowledged'],
            ['open', 'Open'],
            ['acknowledged', 'Acknowledged'],
            ['resolved', 'Resolved'],
          ]}
        />
        <Select
          id="f-kind"
          label="Kind"
          value={filters.kind ?? ''}
          onChange={(v) => set('kind', v)}
          options={[['', 'Any kind'], ...alertKinds.map((k) => [k, alertLabels[k]] as [string, string])]}
        />
        <Select
          id="f-severity"
          label="Severity"
          value={filters.severity ?? ''}
          onChange={(v) => set('severity', v)}
          options={[['', 'Any severity'], ...alertSeverities.map((s) => [s, severityLabels[s]] as [string, string])]}
        />
        <Select
          id="f-assignee"
          label="Assigned to"
          value={filters.assignee ?? ''}
          onChange={(v) => set('assignee', v)}
          options={[
            ['', 'Anyone'],
            [me, 'Me'],
            ['none', 'Nobody'],
            ...staff.filter((s) => s.id !== me).map((s) => [s.id, s.name ?? s.email] as [string, string]),
          ]}
        />
        <Select
          id="f-town"
          label="Town"
          value={filters.town ?? ''}
          onChange={(v) => set('town', v)}
          options={[['', 'Every town'], ...towns.map((t) => [t, t] as [string, string])]}
        />
      </form>

      <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Bulk actions">
        <label className="flex items-center gap-2 text-sm">
          <input
            type="checkbox"
            checked={openIds.length > 0 && openIds.every((id) => selected.has(id))}
            disabled={openIds.length === 0}
            onChange={(e) => setSelected(e.target.checked ? new Set(openIds) : new Set())}
          />{' '}
          Select all open on this page
        </label>
        <div className="min-w-[16rem] flex-1">
          <label className="label" htmlFor="ack-note">
            Note (optional)
          </label>
          <input
            id="ack-note"
            className="field py-1.5 text-sm"
            value={note}
            onChange={(e) => setNote(e.target.value)}
            maxLength={2000}
            placeholder="e.g. visit booked for Thursday"
          />
        </div>
        <button
          type="button"
          className="btn-primary"
          disabled={selected.size === 0 || ack.isPending}
          onClick={() => ack.mutate()}
        >
          Acknowledge {selected.size > 0 ? selected.size : ''}
        </button>
      </div>
      {error ? (
        <div role="alert" className="rounded-card border border-brick bg-brick-pale p-3 text-sm">
          {error instanceof ApiError ? error.message : 'The change could not be saved.'}
        </div>
      ) : null}

      {list.isPending ? (
        <Loading label="Loading alerts…" />
      ) : list.isError && !list.data ? (
        <ErrorNotice error={list.error} what="the alerts" onRetry={() => void list.refetch()} />
      ) : items.length === 0 ? (
        <Empty>No alerts match these filters.</Empty>
      ) : (
        <ul className="space-y-2" aria-label="Alerts">
          {items.map((a) => (
            <li
              key={a.id}
              className={cn('card flex flex-wrap gap-x-4 gap-y-2', a.state === 'resolved' && 'opacity-80')}
              data-alert-kind={a.kind}
              data-alert-state={a.state}
            >
              <div className="pt-1">
                <input
                  type="checkbox"
                  aria-label={`Select ${alertLabels[a.kind]} at ${a.tank.serial}`}
                  disabled={a.state !== 'open'}
                  checked={selected.has(a.id)}
                  onChange={(e) => {
                    const n = new Set(selected);
                    if (e.target.checked) n.add(a.id);
                    else n.delete(a.id);
                    setSelected(n);
                  }}
                />
              </div>
              <div className="min-w-0 flex-1 space-y-1">
                <div className="flex flex-wrap items-center gap-2">
                  <span className={cn('rounded px-1.5 py-0.5 text-xs font-semibold', severityTone[a.severity])}>
                    {severityLabels[a.severity]}
                  </span>
                  <span className="font-semibold">{alertLabels[a.kind]}</span>
                  <a className="figure text-sm text-tide-deep underline" href={tankLink(a)}>
                    {a.tank.serial}
                  </a>
                  {a.home && (
                    <span className="text-sm text-ink-soft">
                      {a.home.addressLine}, {a.home.town}
                    </span>
                  )}
                </div>
                <p className="text-sm text-ink-soft">{a.evidence.summary}</p>
                <p className="text-xs text-ink-muted">
                  Since {fmt(a.openedAt)} · <span className={stateTone[a.state]}>{stateLabels[a.state]}</span>
                  {a.acknowledgedAt && ` by ${a.acknowledgedBy ?? 'someone'} ${fmt(a.acknowledgedAt)}`}
                  {a.resolvedAt &&
                    (a.autoResolved
                      ? ` · cleared by itself ${fmt(a.resolvedAt)}`
                      : ` · resolved by ${a.resolvedBy ?? 'someone'} ${fmt(a.resolvedAt)}`)}
                  {a.note && <> · “{a.note}”</>}
                </p>
              </div>
              <div className="flex flex-wrap items-center gap-2">
                <label className="sr-only" htmlFor={`asg-${a.id}`}>
                  Assign {alertLabels[a.kind]} at {a.tank.serial}
                </label>
                <select
                  id={`asg-${a.id}`}
                  className="field w-44 py-1 text-sm"
                  value={a.assignee?.id ?? ''}
                  disabled={a.state === 'resolved'}
                  onChange={(e) =>
                    act.mutate({ id: a.id, body: { action: 'assign', assigneeId: e.target.value || null } })
                  }
                >
                  <option value="">Unassigned</option>
                  {staff.map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.id === me ? 'Me' : (s.name ?? s.email)}
                    </option>
                  ))}
                </select>
                {a.state !== 'resolved' && (
                  <button
                    type="button"
                    className="btn-quiet py-1"
                    onClick={() => act.mutate({ id: a.id, body: { action: 'resolve', note: note || undefined } })}
                  >
                    Resolve
                  </button>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export default withQuery(AlertInbox);
