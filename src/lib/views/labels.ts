// Words for stored codes, shared by the server and the islands (no dependencies, so islands stay small).
import type { HeatSource } from '../../db/schema/homes';

export const heatSourceValues = ['hp_plate', 'hp_coil', 'immersion_only', 'boiler_coil'] as const satisfies readonly HeatSource[];

export const heatSourceLabels: Record<HeatSource, string> = {
  hp_plate: 'Heat pump, plate exchanger',
  hp_coil: 'Heat pump, coil',
  immersion_only: 'Immersion only',
  boiler_coil: 'Boiler, coil',
};

export const hasHeatPump = (s: HeatSource): boolean => s === 'hp_plate' || s === 'hp_coil';

export const statusLabels = { offline: 'Not reporting', attention: 'Needs attention', ok: 'Fine' } as const;
