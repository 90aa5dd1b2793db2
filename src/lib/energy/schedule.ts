// A plan as commands for the tank: consecutive steps with the same source merged into windows.
import type { PlanAction } from './plan-model.js';

/** One window of a heat source being on, as sent on the command channel. */
export interface CommandWindow {
  /** Window start, ISO 8601 UTC. */ start: string;
  /** Window end (exclusive), ISO 8601 UTC. */ end: string;
  source: 'heat_pump' | 'immersion';
}

/**
 * Windows of each source from per-step actions (steps of `stepMin` minutes from `startMs`), ordered
 * by start, heat pump before immersion when both start together. Overlapping windows of different
 * sources mean both run.
 */
export function commandSchedule(actions: readonly PlanAction[], startMs: number, stepMin: number): CommandWindow[] {
  const out: { startMs: number; w: CommandWindow }[] = [];
  const stepMs = stepMin * 60_000;
  for (const [bit, source] of [
    [2, 'heat_pump'],
    [1, 'immersion'],
  ] as const) {
    let open = -1;
    for (let t = 0; t <= actions.length; t++) {
      const on = t < actions.length && (actions[t]! & bit) !== 0;
      if (on && open < 0) open = t;
      if (!on && open >= 0) {
        const a = startMs + open * stepMs;
        out.push({
          startMs: a,
          w: { start: new Date(a).toISOString(), end: new Date(startMs + t * stepMs).toISOString(), source },
        });
        open = -1;
      }
    }
  }
  return out.sort((x, y) => x.startMs - y.startMs || (x.w.source === 'heat_pump' ? -1 : 1)).map((x) => x.w);
}
