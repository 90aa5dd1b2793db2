// Query option factories for the tank views: one place for keys, URLs and poll intervals.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { EventsResponse, FleetSummary, ReadingsResponse, TankDetail, TankListResponse } from '../views/contracts';
import { mergeSeries } from '../views/series-merge';
import { fetchJson } from './client';

/** New readings arrive about once a minute; polling at 10 s shows them within the live target. */
const LIVE_MS = 10_000;

export interface TankListParams {
  q?: string;
  status?: string;
  alert?: string;
  town?: string;
  heatSource?: string;
  sort?: string;
  dir?: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

function toSearch(params: object): string {
  const s = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== '') s.set(k, String(v));
  return s.toString();
}

export const tankListQuery = (p: TankListParams) =>
  queryOptions({
    queryKey: ['tanks', 'list', p],
    queryFn: () => fetchJson<TankListResponse>(`/api/tanks?${toSearch(p)}`),
    refetchInterval: LIVE_MS,
    placeholderData: keepPreviousData,
  });

export const fleetSummaryQuery = () =>
  queryOptions({
    queryKey: ['fleet', 'summary'],
    queryFn: () => fetchJson<FleetSummary>('/api/fleet/summary'),
    refetchInterval: LIVE_MS,
  });

export const tankQuery = (id: string) =>
  queryOptions({
    queryKey: ['tanks', id],
    queryFn: () => fetchJson<TankDetail>(`/api/tanks/${id}`),
    refetchInterval: LIVE_MS,
  });

/** A live window is fetched in full at most this often; polls between fetch only what is new. */
const FULL_REFETCH_MS = 5 * 60_000;

/** The readings in a window, with when it was last fetched in full (late readings are picked up then). */
export type ReadingsWindow = ReadingsResponse & { fullAt: number };

const readingsUrl = (
  id: string,
  from: number,
  to: number,
  poll?: { since: number; resolution: ReadingsResponse['resolution'] },
) =>
  `/api/tanks/${id}/readings?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString(), ...(poll ? { resolution: poll.resolution, since: new Date(poll.since).toISOString() } : {}) })}`;

/**
 * Ranges of a day or less poll at the live rate; longer ones (rollups) once a minute. A live window
 * (a preset, ending now) is one cache entry whatever minute it ends at: each poll asks only for the
 * points since its newest one (their figures still worked out over the whole window) and merges them.
 */
export const readingsQuery = (id: string, from: number, to: number, live: boolean) =>
  queryOptions({
    queryKey: live ? ['tanks', id, 'readings', 'live', to - from] : ['tanks', id, 'readings', from, to],
    queryFn: async ({ client, queryKey, signal }): Promise<ReadingsWindow> => {
      const prev = live ? client.getQueryData<ReadingsWindow>(queryKey) : undefined;
      const newest = prev?.t.at(-1);
      if (prev && newest !== undefined && newest >= from && Date.now() - prev.fullAt < FULL_REFETCH_MS) {
        const next = await fetchJson<ReadingsResponse>(
          readingsUrl(id, from, to, { since: newest, resolution: prev.resolution }),
          { signal },
        );
        return { ...mergeSeries(prev, next, from), fullAt: prev.fullAt };
      }
      return { ...(await fetchJson<ReadingsResponse>(readingsUrl(id, from, to), { signal })), fullAt: Date.now() };
    },
    refetchInterval: live ? (to - from <= 86_400_000 ? LIVE_MS : 60_000) : false,
    placeholderData: keepPreviousData,
  });

export const eventsQuery = (id: string, from: number, to: number, live: boolean) =>
  queryOptions({
    queryKey: ['tanks', id, 'events', from, to],
    queryFn: () =>
      fetchJson<EventsResponse>(
        `/api/tanks/${id}/events?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })}`,
      ),
    refetchInterval: live ? LIVE_MS : false,
    placeholderData: keepPreviousData,
  });

export const exportUrl = (id: string, from: number, to: number) =>
  `/api/tanks/${id}/export.csv?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })}`;
