import { useQuery } from '@tanstack/react-query';
import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type ColumnOrderState,
  type VisibilityState,
} from '@tanstack/react-table';
import { useEffect, useMemo, useState } from 'react';
import { tankListQuery, type TankListParams } from '../../lib/query/tanks.queries';
import { attentionKinds, attentionLabels } from '../../lib/views/attention';
import type { TankListItem } from '../../lib/views/contracts';
import { fmtAgo, fmtC, fmtL, fmtPct } from '../../lib/views/format';
import { heatSourceLabels, heatSourceValues, statusLabels } from '../../lib/views/labels';
import { AttentionBadge } from '../ui/AttentionBadge';
import { QualifiedFigure } from '../ui/FiguresQuality';
import { cn } from '../ui/cn';
import { Empty, ErrorNotice, Freshness, Loading } from '../ui/States';
import { useNow } from '../ui/useOnline';

const COLUMNS_KEY = 'heatlayer.tankTable.columns.v1';

/** Column id → the API's sort key, for the columns the server can sort by. */
const sortKeyOf: Record<string, string> = {
  attention: 'attention',
  serial: 'serial',
  town: 'town',
  soc: 'soc',
  v40: 'v40',
  lastSeen: 'lastSeen',
  volume: 'volume',
};

function useColumns(now: number): ColumnDef<TankListItem>[] {
  return useMemo(
    () => [
      {
        id: 'serial',
        header: 'Serial',
        cell: ({ row }) => (
          <a
            className="font-mono font-medium text-dusk underline-offset-2 hover:underline"
            href={`/tanks/${row.original.id}`}
          >
            {row.original.serial}
          </a>
        ),
      },
      // No open alert on a tank never heard from is not "fine": the rules have had nothing to judge.
      {
        id: 'attention',
        header: 'Needs',
        cell: ({ row }) =>
          row.original.attention.length ? (
            <span className="flex flex-wrap gap-1">
              {row.original.attention.map((k) => (
                <AttentionBadge key={k} kind={k} />
              ))}
            </span>
          ) : (
            <span className="text-ink-muted">
              {row.original.lastSeenAt === null ? 'No readings yet' : statusLabels.ok}
            </span>
          ),
      },
      {
        id: 'home',
        header: 'Home',
        cell: ({ row }) =>
          row.original.home ? (
            <span>
              {row.original.home.reference} · {row.original.home.addressLine}
            </span>
          ) : (
            '—'
          ),
      },
      { id: 'town', header: 'Town', cell: ({ row }) => row.original.home?.town ?? '—' },
      {
        id: 'soc',
        header: 'State of charge',
        cell: ({ row }) => <QualifiedFigure value={fmtPct(row.original.soc)} q={row.original.quality} testId="soc" />,
      },
      {
        id: 'v40',
        header: 'V40',
        cell: ({ row }) => <QualifiedFigure value={fmtL(row.original.v40L)} q={row.original.quality} testId="v40" />,
      },
      { id: 'top', header: 'Top', cell: ({ row }) => <span className="figure">{fmtC(row.original.topC)}</span> },
      { id: 'lastSeen', header: 'Last reading', cell: ({ row }) => fmtAgo(row.original.lastSeenAt, now) },
      { id: 'model', header: 'Cylinder', cell: ({ row }) => row.original.model },
      { id: 'volume', header: 'Volume', cell: ({ row }) => <span className="figure">{row.original.volumeL} L</span> },
      { id: 'heatSource', header: 'Heat source', cell: ({ row }) => heatSourceLabels[row.original.heatSource] },
    ],
    [now],
  );
}

const defaultOrder = [
  'serial',
  'attention',
  'home',
  'town',
  'soc',
  'v40',
  'top',
  'lastSeen',
  'model',
  'volume',
  'heatSource',
];
const defaultHidden: VisibilityState = { model: false, volume: false };

function loadLayout(): { order: ColumnOrderState; visibility: VisibilityState } {
  try {
    const saved = JSON.parse(localStorage.getItem(COLUMNS_KEY) ?? 'null') as {
      order?: string[];
      visibility?: VisibilityState;
    } | null;
    if (saved?.order) {
      const known = saved.order.filter((id) => defaultOrder.includes(id));
      return {
        order: [...known, ...defaultOrder.filter((id) => !known.includes(id))],
        visibility: saved.visibility ?? defaultHidden,
      };
    }
  } catch {
    /* a damaged entry falls back to the default layout */
  }
  return { order: defaultOrder, visibility: defaultHidden };
}

function paramsFromUrl(): TankListParams {
  const s = new URLSearchParams(typeof window === 'undefined' ? '' : window.location.search);
  return {
    q: s.get('q') ?? undefined,
    status: s.get('status') ?? undefined,
    alert: s.get('alert') ?? undefined,
    town: s.get('town') ?? undefined,
    heatSource: s.get('heatSource') ?? undefined,
    sort: s.get('sort') ?? 'attention',
    dir: (s.get('dir') as 'asc' | 'desc' | null) ?? undefined,
    page: Math.max(1, Number(s.get('page')) || 1),
    pageSize: [25, 50, 100].includes(Number(s.get('pageSize'))) ? Number(s.get('pageSize')) : 25,
  };
}

/** Every tank of the company: filters, server-side sort and paging, chosen and ordered columns. */
export function TankTable({ towns }: { towns: string[] }) {
  const now = useNow();
  const [params, setParams] = useState<TankListParams>(paramsFromUrl);
  const [search, setSearch] = useState(params.q ?? '');
  const [layout, setLayout] = useState(loadLayout);
  const [chooserOpen, setChooserOpen] = useState(false);
  const list = useQuery(tankListQuery(params));
  const columns = useColumns(now);

  // The search box waits for a pause in typing before asking the server.
  useEffect(() => {
    const t = setTimeout(
      () => setParams((p) => ((p.q ?? '') === search ? p : { ...p, q: search || undefined, page: 1 })),
      300,
    );
    return () => clearTimeout(t);
  }, [search]);
  useEffect(() => {
    const s = new URLSearchParams();
    for (const [k, v] of Object.entries(params))
      if (
        v !== undefined &&
        v !== '' &&
        !(k === 'page' && v === 1) &&
        !(k === 'pageSize' && v === 25) &&
        !(k === 'sort' && v === 'attention')
      )
        s.set(k, String(v));
    const qs = s.toString();
    window.history.replaceState(null, '', `${window.location.pathname}${qs ? `?${qs}` : ''}`);
  }, [params]);
  useEffect(() => {
    localStorage.setItem(COLUMNS_KEY, JSON.stringify(layout));
  }, [layout]);

  const data = list.data?.items ?? [];
  const total = list.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / params.pageSize));
  const table = useReactTable({
    data,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.id,
    manualPagination: true,
    manualSorting: true,
    pageCount: pages,
    state: { columnOrder: layout.order, columnVisibility: layout.visibility },
    onColumnOrderChange: (u) => setLayout((l) => ({ ...l, order: typeof u === 'function' ? u(l.order) : u })),
    onColumnVisibilityChange: (u) =>
      setLayout((l) => ({ ...l, visibility: typeof u === 'function' ? u(l.visibility) : u })),
  });
  const set = (patch: Partial<TankListParams>) => setParams((p) => ({ ...p, page: 1, ...patch }));
  const sortBy = (id: string) => {
    const key = sortKeyOf[id];
    if (!key) return;
    setParams((p) => ({
      ...p,
      page: 1,
      sort: key,
      dir: p.sort === key ? (p.dir === 'desc' ? 'asc' : 'desc') : undefined,
    }));
  };
  const move = (id: string, by: -1 | 1) =>
    setLayout((l) => {
      const order = [...l.order];
      const i = order.indexOf(id);
      const j = i + by;
      if (i < 0 || j < 0 || j >= order.length) return l;
      [order[i], order[j]] = [order[j]!, order[i]!];
      return { ...l, order };
    });

  return (
    <section aria-labelledby="all-tanks" className="card">
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <h2 id="all-tanks" className="mr-auto text-lg font-semibold">
          All cylinders
        </h2>
        {list.dataUpdatedAt > 0 && <Freshness updatedAt={list.dataUpdatedAt} fetching={list.isFetching} />}
      </div>
      <form
        className="mb-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-6"
        role="search"
        onSubmit={(e) => e.preventDefault()}
      >
        <div className="lg:col-span-2">
          <label className="label" htmlFor="tank-search">
            Search
          </label>
          <input
            id="tank-search"
            className="field"
            type="search"
            placeholder="Serial, reference, address, postcode, name"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
          />
        </div>
        <Select
          id="f-status"
          label="Status"
          value={params.status}
          onChange={(v) => set({ status: v })}
          options={Object.entries(statusLabels)}
        />
        <Select
          id="f-alert"
          label="Problem"
          value={params.alert}
          onChange={(v) => set({ alert: v })}
          options={attentionKinds.map((k) => [k, attentionLabels[k]])}
        />
        <Select
          id="f-town"
          label="Town"
          value={params.town}
          onChange={(v) => set({ town: v })}
          options={towns.map((t) => [t, t])}
        />
        <Select
          id="f-source"
          label="Heat source"
          value={params.heatSource}
          onChange={(v) => set({ heatSource: v })}
          options={heatSourceValues.map((h) => [h, heatSourceLabels[h]])}
        />
      </form>

      <div className="mb-2 flex flex-wrap items-center gap-3 text-sm">
        <span aria-live="polite">
          {list.data ? `${total.toLocaleString('en-GB')} cylinder${total === 1 ? '' : 's'}` : ' '}
        </span>
        <button
          type="button"
          className="btn-quiet ml-auto py-1"
          aria-expanded={chooserOpen}
          aria-controls="column-chooser"
          onClick={() => setChooserOpen((o) => !o)}
        >
          Columns
        </button>
      </div>
      {chooserOpen && (
        <fieldset id="column-chooser" className="mb-3 rounded-md border border-line p-3">
          <legend className="px-1 text-sm font-medium">Show and order columns (remembered on this device)</legend>
          <ol className="grid gap-1 sm:grid-cols-2 lg:grid-cols-3">
            {layout.order.map((id, i) => {
              const col = table.getColumn(id);
              if (!col) return null;
              const name = String(col.columnDef.header);
              return (
                <li key={id} className="flex items-center gap-2">
                  <input
                    id={`col-${id}`}
                    type="checkbox"
                    checked={col.getIsVisible()}
                    onChange={col.getToggleVisibilityHandler()}
                    disabled={id === 'serial'}
                  />
                  <label htmlFor={`col-${id}`} className="mr-auto text-sm">
                    {name}
                  </label>
                  <button
                    type="button"
                    className="btn-quiet px-2 py-0.5"
                    aria-label={`Move ${name} earlier`}
                    disabled={i === 0}
                    onClick={() => move(id, -1)}
                  >
                    ↑
                  </button>
                  <button
                    type="button"
                    className="btn-quiet px-2 py-0.5"
                    aria-label={`Move ${name} later`}
                    disabled={i === layout.order.length - 1}
                    onClick={() => move(id, 1)}
                  >
                    ↓
                  </button>
                </li>
              );
            })}
          </ol>
          <button
            type="button"
            className="btn-quiet mt-2 py-1"
            onClick={() => setLayout({ order: defaultOrder, visibility: defaultHidden })}
          >
            Reset columns
          </button>
        </fieldset>
      )}

      {list.isPending ? (
        <Loading label="Loading cylinders…" />
      ) : list.isError && !list.data ? (
        <ErrorNotice what="the cylinders" error={list.error} onRetry={() => list.refetch()} />
      ) : data.length === 0 ? (
        <Empty>No cylinder matches these filters.</Empty>
      ) : (
        <div
          className="max-h-[70vh] overflow-auto rounded-md border border-line"
          role="region"
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrolling region must take focus so a keyboard can scroll it (WCAG 2.1.1)
          tabIndex={0}
          aria-label="Cylinders table, scrollable"
        >
          <table className="w-full border-collapse text-sm">
            <thead>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const key = sortKeyOf[h.column.id];
                    const active = key && params.sort === key;
                    const ariaSort = active
                      ? (params.dir ?? (key === 'lastSeen' ? 'desc' : 'asc')) === 'asc'
                        ? 'ascending'
                        : 'descending'
                      : undefined;
                    return (
                      <th
                        key={h.id}
                        scope="col"
                        aria-sort={ariaSort}
                        className="sticky top-0 z-10 whitespace-nowrap border-b border-line-strong bg-paper-sunk px-3 py-2 text-left font-medium text-ink-soft"
                      >
                        {key ? (
                          <button
                            type="button"
                            className="inline-flex items-center gap-1 hover:text-ink"
                            onClick={() => sortBy(h.column.id)}
                          >
                            {flexRender(h.column.columnDef.header, h.getContext())}
                            <span aria-hidden="true">{active ? (ariaSort === 'ascending' ? '▲' : '▼') : '↕'}</span>
                          </button>
                        ) : (
                          flexRender(h.column.columnDef.header, h.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <tr
                  key={row.id}
                  className={cn(
                    'cursor-pointer border-b border-line last:border-0 hover:bg-paper-sunk/70',
                    row.original.status === 'offline' && 'bg-paper-sunk/40',
                  )}
                  onClick={(e) => {
                    if (!(e.target as HTMLElement).closest('a,button'))
                      window.location.assign(`/tanks/${row.original.id}`);
                  }}
                >
                  {row.getVisibleCells().map((c) => (
                    <td key={c.id} className="px-3 py-2 align-top">
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}

      <nav aria-label="Pages" className="mt-3 flex flex-wrap items-center gap-2 text-sm">
        <button
          type="button"
          className="btn-quiet py-1"
          disabled={params.page <= 1}
          onClick={() => setParams((p) => ({ ...p, page: p.page - 1 }))}
        >
          Previous
        </button>
        <span>
          Page {params.page} of {pages}
        </span>
        <button
          type="button"
          className="btn-quiet py-1"
          disabled={params.page >= pages}
          onClick={() => setParams((p) => ({ ...p, page: p.page + 1 }))}
        >
          Next
        </button>
        <label className="ml-auto flex items-center gap-2">
          Rows per page
          <select
            className="field w-auto py-1"
            value={params.pageSize}
            onChange={(e) => set({ pageSize: Number(e.target.value) })}
          >
            {[25, 50, 100].map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        </label>
      </nav>
    </section>
  );
}

function Select({
  id,
  label,
  value,
  onChange,
  options,
}: {
  id: string;
  label: string;
  value?: string;
  onChange: (v: string | undefined) => void;
  options: [string, string][];
}) {
  return (
    <div>
      <label className="label" htmlFor={id}>
        {label}
      </label>
      <select id={id} className="field" value={value ?? ''} onChange={(e) => onChange(e.target.value || undefined)}>
        <option value="">Any</option>
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </div>
  );
}
