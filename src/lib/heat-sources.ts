// The heat sources a cylinder can be fitted with, and what each one implies. The one list: the
// schema's enum, the labels, the commissioning steps, the alert rules and the planner all read it,
// so a new kind is added here once. Pure and without dependencies (islands import it).

/** Stored codes, in the order of the database enum `heat_source` (changing it needs a migration). */
export const heatSourceKinds = ['hp_plate', 'hp_coil', 'immersion_only', 'boiler_coil'] as const;
export type HeatSource = (typeof heatSourceKinds)[number];

export interface HeatSourceCapabilities {
  /** A heat pump heats the water: compressor runs, COP, short-cycling, the immersion's share of the heat. */
  heatPump: boolean;
  /** A boiler heats the water through the cylinder's coil (its fuel is not metered here). */
  boiler: boolean;
  /** Whether the immersion element is the only heater or a back-up beside the main source. */
  immersion: 'only' | 'backup';
  /** What the cylinder needs for the primary circuit: ports for a plate heat exchanger, an internal coil, or nothing. */
  exchanger: 'plate_ports' | 'coil' | null;
  /** The main source's electricity is in the readings' power and priced by the tariff (so the planner may schedule it). */
  electricMain: boolean;
}

const table: Record<HeatSource, HeatSourceCapabilities & { label: string; description: string }> = {
  hp_plate: {
    heatPump: true,
    boiler: false,
    immersion: 'backup',
    exchanger: 'plate_ports',
    electricMain: true,
    label: 'Heat pump, plate exchanger',
    description: 'Heat pump through a plate heat exchanger',
  },
  hp_coil: {
    heatPump: true,
    boiler: false,
    immersion: 'backup',
    exchanger: 'coil',
    electricMain: true,
    label: 'Heat pump, coil',
    description: 'Heat pump through the cylinder’s coil',
  },
  immersion_only: {
    heatPump: false,
    boiler: false,
    immersion: 'only',
    exchanger: null,
    electricMain: true,
    label: 'Immersion only',
    description: 'Immersion heater only',
  },
  boiler_coil: {
    heatPump: false,
    boiler: true,
    immersion: 'backup',
    exchanger: 'coil',
    electricMain: false,
    label: 'Boiler, coil',
    description: 'Boiler through the cylinder’s coil',
  },
};

export const isHeatSource = (v: unknown): v is HeatSource =>
  typeof v === 'string' && (heatSourceKinds as readonly string[]).includes(v);

export function capabilities(kind: HeatSource): HeatSourceCapabilities {
  const c = table[kind];
  if (!c) throw new RangeError(`heatSource is ${String(kind)}: it must be one of ${heatSourceKinds.join(', ')}.`);
  const { heatPump, boiler, immersion, exchanger, electricMain } = c;
  return { heatPump, boiler, immersion, exchanger, electricMain };
}

export const hasHeatPump = (kind: HeatSource): boolean => capabilities(kind).heatPump;
/** A main source (heat pump or boiler) beside the immersion: the tank model's and the simulator's `hpOn`. */
export const hasMainSource = (kind: HeatSource): boolean => capabilities(kind).heatPump || capabilities(kind).boiler;

/** Short words for lists and headings. */
export const heatSourceLabels = Object.fromEntries(heatSourceKinds.map((k) => [k, table[k].label])) as Record<
  HeatSource,
  string
>;
/** A fuller phrase for forms and the signed record. */
export const heatSourceDescriptions = Object.fromEntries(
  heatSourceKinds.map((k) => [k, table[k].description]),
) as Record<HeatSource, string>;

/** The kinds with a heat pump (for SQL `in (…)` lists and filters). */
export const heatPumpKinds: readonly HeatSource[] = heatSourceKinds.filter((k) => table[k].heatPump);
