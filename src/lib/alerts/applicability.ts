// Which alert rules a cylinder takes, from what its heat source can do. A heat pump's own rules
// (short-cycling, the immersion doing a heat pump's work) apply only where there is a heat pump:
// a boiler-fed or immersion-only cylinder is not short-cycling a compressor it does not have, and
// its immersion is not displacing cheaper heat-pump heat. Pure.
import { capabilities, type HeatSource } from '../heat-sources';
import type { AlertKind } from './types';

export function ruleApplies(kind: AlertKind, heatSource: HeatSource): boolean {
  switch (kind) {
    case 'short_cycling':
    case 'immersion_heavy':
      return capabilities(heatSource).heatPump;
    case 'offline':
    case 'sensor_fault':
    case 'legionella_risk':
    case 'low_hot_water':
    case 'heat_loss':
      return true;
  }
}
