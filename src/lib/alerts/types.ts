// Names shared by the rules, the schema and the pages. Pure: no I/O.
import type { EngineState } from './engine';

export const alertKinds = [
  'offline',
  'sensor_fault',
  'legionella_risk',
  'short_cycling',
  'low_hot_water',
  'immersion_heavy',
  'heat_loss',
] as const;
export type AlertKind = (typeof alertKinds)[number];

export const alertSeverities = ['critical', 'warning', 'info'] as const;
export type AlertSeverity = (typeof alertSeverities)[number];

export const alertStates = ['open', 'acknowledged', 'resolved'] as const;
export type AlertState = (typeof alertStates)[number];

/** What the desk reads (trade terms allowed). */
export const alertLabels: Record<AlertKind, string> = {
  offline: 'Not reporting',
  sensor_fault: 'Sensor fault',
  legionella_risk: 'Legionella risk',
  short_cycling: 'Heat pump short-cycling',
  low_hot_water: 'Low hot water ahead of use',
  immersion_heavy: 'Immersion doing the work',
  heat_loss: 'Heat loss above declared',
};

export const severityLabels: Record<AlertSeverity, string> = {
  critical: 'Severe',
  warning: 'Warning',
  info: 'Advisory',
};
export const stateLabels: Record<AlertState, string> = {
  open: 'Open',
  acknowledged: 'Acknowledged',
  resolved: 'Resolved',
};

/** The kinds a householder is told about, in plain words (the rest are for the installer). */
export const householderKinds: readonly AlertKind[] = ['legionella_risk', 'low_hot_water', 'immersion_heavy'];

/** What triggered an alert, kept with it. */
export interface AlertEvidence {
  /** One sentence a person can act on. */
  summary: string;
  /** The figures behind it (thresholds included, so the evidence reads on its own). */
  facts: Record<string, number | string | boolean | null>;
  /** A few readings that show it (telemetry time, epoch ms; layers °C bottom to top). */
  readings?: { ts: number; layersC: (number | null)[]; compressor?: boolean; immersionW?: number }[];
  /** Runs or periods that show it (epoch ms). */
  events?: { kind: string; start: number; end: number | null; detail?: string }[];
  /** The telemetry time the evidence points at (the tank view opens there). */
  at: number;
}

export type { EngineState };
