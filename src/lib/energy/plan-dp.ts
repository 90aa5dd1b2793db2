// Exact dynamic programme over the planner's discretised model (plan-model.ts).
//
// State at the start of step t: grid index j of the stored heat, whether the heat pump ran in the
// previous step, and m, the whole steps since its last start (capped at K). A start (off → on) is
// allowed only when m ≥ K, K = ceil(minimum start spacing / step length), so two starts are never
// closer than the spacing; at 30-minute steps and a 60-minute spacing the rule still bites on the
// first step when the compressor started shortly before the plan begins.
// Objective, compared lexicographically: first the comfort shortfall (litres of V40 below each
// step's floor, summed over steps), then the cost in pence plus a small charge per compressor start,
// less a credit for heat left at the end.
// Ties go to the earlier action in PLAN_ACTIONS (none, immersion, heat pump, both), so the answer
// is deterministic.
import type { PlanAction, PlanModel } from './plan-model.js';

/** Memory of the compressor at the start of a plan. */
export interface StartMemory {
  /** The heat pump was running just before the plan starts. */ running: boolean;
  /** Whole steps since its last start, capped at `spacingSteps` (use spacingSteps when long ago or never). */ stepsSinceStart: number;
  /** K: a start needs at least this many steps since the previous one. */ spacingSteps: number;
}

/** Settings of one solve. */
export interface DpSettings {
  /** Comfort floor of each step, litres of V40. */ floorsL40: readonly number[];
  /** Credit for each kWh stored at the end of the horizon, pence. */ terminalCreditPence: number;
  /** Cost charged for each compressor start, pence: a small figure prefers one long run to several short ones at equal price. */ startPenaltyPence: number;
  memory: StartMemory;
}

/** The optimum and how the model expects it to go. */
export interface DpResult {
  actions: PlanAction[];
  /** Litres of V40 below the floors, summed over steps (0 when the model meets every floor). */ shortfallL40: number;
  /** Electricity cost, pence (without the terminal credit). */ costPence: number;
  /** Compressor starts. */ starts: number;
  /** Objective: cost plus start penalties less the terminal credit, pence. */ objectivePence: number;
  /** Model V40 at each step's low point, litres. */ lowV40: number[];
  /** Model stored heat at the end of each step, kWh. */ energyKWh: number[];
  /** Electricity of each step, kWh. */ electricityKWh: number[];
}

const EPS = 1e-9;

/** Memory after `action` from (running, m); null when the action is a start the spacing forbids. */
function nextMemory(
  running: boolean,
  m: number,
  action: PlanAction,
  k: number,
): { running: boolean; m: number } | null {
  const hp = (action & 2) !== 0;
  if (hp && !running) return m >= k ? { running: true, m: Math.min(k, 1) } : null;
  return { running: hp, m: Math.min(k, m + 1) };
}

/** Solve the planning problem exactly on the model's grid. */
export function solveDp(model: PlanModel, settings: DpSettings): DpResult {
  const T = model.steps;
  const k = settings.memory.spacingSteps;
  const J = model.jMax - model.jMin + 1;
  const M = 2 * (k + 1);
  const size = J * M;
  let shortNext = new Float64Array(size);
  let costNext = new Float64Array(size);
  let shortCur = new Float64Array(size);
  let costCur = new Float64Array(size);
  for (let jj = 0; jj < J; jj++) {
    const credit = -settings.terminalCreditPence * Math.max(0, model.energyAt(T, jj + model.jMin));
    for (let mi = 0; mi < M; mi++) costNext[jj * M + mi] = credit;
  }
  const policy = new Uint8Array(T * size);
  const acts = model.actions;
  const nA = acts.length;
  const tNext = new Int32Array(J * nA);
  const tShort = new Float64Array(J * nA);
  const tCost = new Float64Array(J * nA);
  // Memory transitions do not depend on j or t: tabulate them once (−1 = forbidden start).
  const memNext = new Int32Array(M * nA);
  const memCost = new Float64Array(M * nA);
  for (let mi = 0; mi < M; mi++) {
    const running = mi >= k + 1;
    const m = mi - (running ? k + 1 : 0);
    for (let ai = 0; ai < nA; ai++) {
      const nm = nextMemory(running, m, acts[ai]!, k);
      memNext[mi * nA + ai] = nm === null ? -1 : (nm.running ? k + 1 : 0) + nm.m;
      memCost[mi * nA + ai] = !running && (acts[ai]! & 2) !== 0 ? settings.startPenaltyPence : 0;
    }
  }

  // Memory states that cannot occur: m = 0 after the first step, and "stopped with m = 1" after the
  // second (m = 1 follows a start, so the pump is running, unless m was 0 when the plan began).
  const firstStep = new Int8Array(M); // 0 = m is 0; 1 = stopped with m = 1 (K > 1); 2 = other
  for (let mi = 0; mi < M; mi++) {
    const running = mi >= k + 1;
    const m = mi - (running ? k + 1 : 0);
    firstStep[mi] = k > 0 && m === 0 ? 0 : k > 1 && !running && m === 1 ? 1 : 2;
  }

  for (let t = T - 1; t >= 0; t--) {
    const floor = settings.floorsL40[t]!;
    model.fillStep(t, tNext, tCost, tShort);
    for (let i = 0; i < J * nA; i++) {
      tNext[i] = tNext[i]! - model.jMin;
      const s = floor - tShort[i]!;
      tShort[i] = Math.max(s, 0);
    }
    for (let jj = 0; jj < J; jj++) {
      const row = jj * nA;
      for (let mi = 0; mi < M; mi++) {
        if (firstStep[mi]! < t && firstStep[mi]! < 2) continue;
        let bestS = Infinity,
          bestC = Infinity,
          bestA = 0;
        const memRow = mi * nA;
        for (let ai = 0; ai < nA; ai++) {
          const nmi = memNext[memRow + ai]!;
          if (nmi < 0) continue;
          const idx = tNext[row + ai]! * M + nmi;
          const s = tShort[row + ai]! + shortNext[idx]!;
          const c = tCost[row + ai]! + memCost[memRow + ai]! + costNext[idx]!;
          // Less shortfall, or as little and cheaper (lexicographic, within EPS).
          if (s < bestS - EPS || (s <= bestS + EPS && c < bestC - EPS)) {
            bestS = s;
            bestC = c;
            bestA = ai;
          }
        }
        shortCur[jj * M + mi] = bestS;
        costCur[jj * M + mi] = bestC;
        policy[t * size + jj * M + mi] = bestA;
      }
    }
    [shortNext, shortCur] = [shortCur, shortNext];
    [costNext, costCur] = [costCur, costNext];
  }

  const mem = settings.memory;
  let j = Math.min(model.jMax, Math.max(model.jMin, model.j0));
  let mi = (mem.running ? k + 1 : 0) + Math.min(k, Math.max(0, mem.stepsSinceStart));
  const actions: PlanAction[] = [],
    lowV40: number[] = [],
    energyKWh: number[] = [],
    electricityKWh: number[] = [];
  let shortfall = 0,
    cost = 0,
    starts = 0;
  for (let t = 0; t < T; t++) {
    const ai = policy[t * size + (j - model.jMin) * M + mi]!;
    const a = acts[ai]!;
    const tr = model.transition(t, j, a);
    actions.push(a);
    lowV40.push(tr.lowV40);
    electricityKWh.push(tr.electricityKWh);
    shortfall += Math.max(0, settings.floorsL40[t]! - tr.lowV40);
    cost += tr.costPence;
    starts += memCost[mi * nA + ai]! > 0 || (!(mi >= k + 1) && (a & 2) !== 0) ? 1 : 0;
    mi = memNext[mi * nA + ai]!;
    j = tr.next;
    energyKWh.push(model.energyAt(t + 1, j));
  }
  const credit = settings.terminalCreditPence * Math.max(0, model.energyAt(T, j));
  return {
    actions,
    shortfallL40: shortfall,
    costPence: cost,
    starts,
    objectivePence: cost + starts * settings.startPenaltyPence - credit,
    lowV40,
    energyKWh,
    electricityKWh,
  };
}
