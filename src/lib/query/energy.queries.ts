// Energy, cost and charge plans of one tank (src/pages/api/tanks/[id]/energy.ts and …/plan), and the fleet's energy figures.
import { queryOptions } from '@tanstack/react-query';
import type { EnergyResponse, FleetEnergyResponse, PlanResponse } from '../tank-energy/contracts';
import { fetchJson } from './client';

/** The last `days` local days up to today. Energy changes slowly: refetch every 5 minutes. */
export const energyQuery = (tankId: string, days = 7) =>
  queryOptions({
    queryKey: ['tanks', tankId, 'energy', days],
    queryFn: () => {
      const to = new Date().toISOString().slice(0, 10);
      const from = new Date(Date.now() - (days - 1) * 86_400_000).toISOString().slice(0, 10);
      return fetchJson<EnergyResponse>(`/api/tanks/${tankId}/energy?from=${from}&to=${to}`);
    },
    refetchInterval: 300_000,
  });

export function fetchPlan(tankId: string, body: { comfortFloorL40: number; hours: number }): Promise<PlanResponse> {
  return fetchJson<PlanResponse>(`/api/tanks/${tankId}/plan`, { method: 'POST', body: JSON.stringify(body) });
}

export function sendPlan(
  tankId: string,
  body: { comfortFloorL40: number; hours: number },
): Promise<{ plan: PlanResponse; command: { id: string; state: string } }> {
  return fetchJson(`/api/tanks/${tankId}/plan/send`, { method: 'POST', body: JSON.stringify(body) });
}

/** The desk's fleet energy figures over local dates (stored days only change once a day ends: refetch every 10 minutes). */
export const fleetEnergyQuery = (from: string, to: string) =>
  queryOptions({
    queryKey: ['fleet', 'energy', from, to],
    queryFn: () => fetchJson<FleetEnergyResponse>(`/api/fleet/energy?from=${from}&to=${to}`),
    refetchInterval: 600_000,
  });
