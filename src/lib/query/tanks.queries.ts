// Query option factories for the tank views: one place for keys, URLs and poll intervals.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { EventsResponse, FleetSummary, ReadingsResponse, TankDetail, TankListResponse } from '../views/contracts';
import { fetchJson } from './client';

/** New readings arrive about once a minute; polling at 10 s shows them within the live target. */
export const LIVE_MS = 10_000;

export interface TankListParams {
  q?: string; status?: string; alert?: string; town?: string; heatSource?: string; sort?: string; dir?: 'asc' | 'desc'; page: number; pageSize: number;
}

export function toSearch(params: object): string {
  const s = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== '') s.set(k, String(v));
  return s.toString();
}

export const tankListQuery = (p: TankListParams) => queryOptions({
  queryKey: ['tanks', 'list', p],
  queryFn: () => fetchJson<TankListResponse>(`/api/tanks?${toSearch(p)}`),
  refetchInterval: LIVE_MS,
  placeholderData: keepPreviousData,
});

export const fleetSummaryQuery = () => queryOptions({
  queryKey: ['fleet', 'summary'],
  queryFn: () => fetchJson<FleetSummary>('/api/fleet/summary'),
  refetchInterval: LIVE_MS,
});

export const tankQuery = (id: string) => queryOptions({
  queryKey: ['tanks', id],
  queryFn: () => fetchJson<TankDetail>(`/api/tanks/${id}`),
  refetchInterval: LIVE_MS,
});

/** Ranges of a day or less poll at the live rate; longer ones (rollups) once a minute. */
export const readingsQuery = (id: string, from: number, to: number, live: boolean) => queryOptions({
  queryKey: ['tanks', id, 'readings', from, to],
  queryFn: () => fetchJson<ReadingsResponse>(`/api/tanks/${id}/readings?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })}`),
  refetchInterval: live ? (to - from <= 86_400_000 ? LIVE_MS : 60_000) : false,
  placeholderData: keepPreviousData,
});

export const eventsQuery = (id: string, from: number, to: number, live: boolean) => queryOptions({
  queryKey: ['tanks', id, 'events', from, to],
  queryFn: () => fetchJson<EventsResponse>(`/api/tanks/${id}/events?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })}`),
  refetchInterval: live ? LIVE_MS : false,
  placeholderData: keepPreviousData,
});

export const exportUrl = (id: string, from: number, to: number) => `/api/tanks/${id}/export.csv?${toSearch({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })}`;
