// Assembles one tank's answer for `GET /api/tanks/{id}`: record, latest figures, attention with its
// evidence, commissioning summary and the 7-day analysis. Server-only (reads through src/db/queries).
import { getTank, tankAttentionFacts, type TankRecord } from '../../db/queries/tanks';
import { readingsInRange } from '../../db/queries/readings';
import { HttpError, type Scope } from '../server/authz';
import { erpClass } from '../thermal';
import { analyseTank } from './analysis';
import { attentionFor, attentionLabels, attentionThresholds as th, sensorFaultIn, statusOf, type AttentionKind } from './attention';
import type { AttentionItem, TankAnalysis, TankDetail } from './contracts';
import { columnFigures, sensorPositions } from './layers';
import { energyToFullKWh } from './refill';

export async function tankOr404(scope: Scope, id: string): Promise<TankRecord> {
  const tank = await getTank(scope, id);
  if (!tank) throw new HttpError(404, 'TankNotFound', 'There is no such tank among the ones you can see.');
  return tank;
}

/** The 7-day analysis reads a week of raw readings; it changes slowly, so it is kept for a few minutes. */
const ANALYSIS_TTL_MS = 5 * 60_000;
const analyses = new Map<string, { at: number; value: Promise<TankAnalysis> }>();

function analysisFor(tank: TankRecord): Promise<TankAnalysis> {
  const hit = analyses.get(tank.id);
  if (hit && Date.now() - hit.at < ANALYSIS_TTL_MS) return hit.value;
  const to = new Date();
  const from = new Date(to.getTime() - th.legionellaWindowDays * 86_400_000);
  const value = readingsInRange(tank.id, from, to, 'raw').then((rows) => analyseTank(rows, { ...tank }, { from, to }));
  value.catch(() => analyses.delete(tank.id));
  analyses.set(tank.id, { at: Date.now(), value });
  if (analyses.size > 2000) analyses.delete(analyses.keys().next().value!);
  return value;
}

function detailOf(kind: AttentionKind, tank: TankRecord, facts: NonNullable<Awaited<ReturnType<typeof tankAttentionFacts>>>): string {
  switch (kind) {
    case 'offline': return tank.latest?.lastSeenAt ? `Nothing received since ${tank.latest.lastSeenAt.toISOString().replace('T', ' ').slice(0, 16)} UTC (limit ${th.offlineAfterMin} min).` : 'Nothing has ever been received from this tank.';
    case 'sensor_fault': return sensorFaultIn(facts.layersC ?? []) ?? 'A sensor reading is out of range.';
    case 'legionella_risk': return `The top sensor did not stay at or above ${th.legionellaC} °C for a whole hour in the last ${th.legionellaWindowDays} days (HSE HSG274 Part 2 asks for storage at ${th.legionellaC} °C).`;
    case 'short_cycling': return `More than one compressor start within ${th.minStartGapMin} min in the last ${th.shortCycleWindowH} h.`;
    case 'low_hot_water': return `V40 ${Math.round(facts.v40L ?? 0)} L, below ${th.lowV40L} L (the 814/2013 minimum for load profile M).`;
    case 'immersion_heavy': return `The immersion used ${Math.round((facts.immersionWh / (facts.immersionWh + facts.compressorWh)) * 100)} % of the electricity for hot water over ${th.legionellaWindowDays} days (limit ${Math.round(th.immersionShareMax * 100)} %).`;
  }
}

export async function tankDetail(scope: Scope, id: string): Promise<TankDetail> {
  const tank = await tankOr404(scope, id);
  const [facts, analysis] = await Promise.all([tankAttentionFacts(tank.id), analysisFor(tank)]);
  const kinds = facts ? attentionFor(facts, Date.now()) : [];
  const attention: AttentionItem[] = kinds.map((k) => ({ kind: k, label: attentionLabels[k], detail: detailOf(k, tank, facts!) }));
  const layersC = tank.latest?.layersC ?? [];
  const figures = layersC.length ? columnFigures(layersC, tank) : null;
  return {
    id: tank.id, serial: tank.serial, model: tank.model, volumeL: tank.volumeL, heightM: tank.heightM, sensorCount: tank.sensorCount,
    positionsM: sensorPositions(tank.sensorCount, tank.heightM, tank.sensorHeightsM),
    heatSource: tank.heatSource, hpOutputW: tank.hpOutputW, immersionRatingW: tank.immersionW, targetC: tank.targetC, hysteresisK: tank.hysteresisK,
    home: tank.home,
    latest: tank.latest ? {
      ts: tank.latest.ts?.toISOString() ?? null, lastSeenAt: tank.latest.lastSeenAt?.toISOString() ?? null, online: tank.latest.online,
      layersC, flowC: tank.latest.flowC, returnC: tank.latest.returnC, compressor: tank.latest.compressor, immersionW: tank.latest.immersionW,
      powerW: tank.latest.powerW, drawLpm: tank.latest.drawLpm,
    } : null,
    figures,
    toFullKWh: layersC.length ? energyToFullKWh(layersC, tank) : null,
    status: statusOf(kinds),
    attention,
    commissioning: {
      commissionedAt: tank.commissionedAt?.toISOString() ?? null, heatSource: tank.heatSource, targetC: tank.targetC, hysteresisK: tank.hysteresisK,
      hpOutputW: tank.hpOutputW, immersionRatingW: tank.immersionW, sensorCount: tank.sensorCount, declaredLossW: tank.declaredLossW,
      declaredClass: tank.declaredLossW !== null ? erpClass({ volumeL: tank.volumeL, standingLossW: tank.declaredLossW }) : null,
    },
    analysis,
  };
}
