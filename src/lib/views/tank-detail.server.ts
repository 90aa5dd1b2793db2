// Assembles one tank's answer for `GET /api/tanks/{id}`: record, latest figures, what needs attention
// (its unresolved alerts with their evidence, the same rows the triage and the inbox read),
// commissioning summary and the 7-day analysis. Server-only (reads through src/db/queries).
import { listAlerts, thresholdsFor } from '../../db/queries/alerts';
import { getTank, type TankRecord } from '../../db/queries/tanks';
import { readingsInRange } from '../../db/queries/readings';
import type { Thresholds } from '../alerts/thresholds';
import { requireTank, type Scope } from '../server/authz';
import { erpClass } from '../thermal';
import { analyseTank } from './analysis';
import { attentionLabels, attentionPriority, statusOf } from './attention';
import type { AttentionItem, TankAnalysis, TankDetail } from './contracts';
import { columnFigures, sensorPositions } from './layers';

/** The 7-day analysis reads a week of raw readings; it changes slowly, so it is kept for a few minutes. */
const ANALYSIS_TTL_MS = 5 * 60_000;
const analyses = new Map<string, { at: number; value: Promise<TankAnalysis> }>();

function analysisFor(tank: TankRecord, th: Thresholds): Promise<TankAnalysis> {
  const hit = analyses.get(tank.id);
  if (hit && Date.now() - hit.at < ANALYSIS_TTL_MS) return hit.value;
  const to = new Date();
  const from = new Date(to.getTime() - th.legionellaWindowDays * 86_400_000);
  // Legionella exposure against the company's own alert settings, so the page and the alert agree.
  const legionella = { thresholdC: th.legionellaC, holdMin: th.legionellaHoldMin };
  const value = readingsInRange(tank.id, from, to, 'raw').then((rows) =>
    analyseTank(rows, { ...tank }, { from, to }, legionella),
  );
  value.catch(() => analyses.delete(tank.id));
  analyses.set(tank.id, { at: Date.now(), value });
  if (analyses.size > 2000) analyses.delete(analyses.keys().next().value!);
  return value;
}

/** The tank's unresolved alerts, most urgent first (the desk's order). */
async function openAlertsOf(scope: Scope, tankId: string): Promise<AttentionItem[]> {
  const { items } = await listAlerts(scope, { tankId, state: 'active' });
  return items
    .sort((a, b) => attentionPriority[a.kind] - attentionPriority[b.kind])
    .map((a) => ({
      kind: a.kind,
      label: attentionLabels[a.kind],
      detail: a.evidence.summary,
      alertId: a.id,
      severity: a.severity,
      state: a.state as AttentionItem['state'],
      openedAt: a.openedAt,
      at: a.evidence.at,
    }));
}

export async function tankDetail(scope: Scope, id: string): Promise<TankDetail> {
  const tank = await requireTank(getTank, scope, id);
  const th = await thresholdsFor(scope.companyId);
  const [attention, analysis] = await Promise.all([openAlertsOf(scope, tank.id), analysisFor(tank, th)]);
  const layersC = tank.latest?.layersC ?? [];
  // The writer's figures of the same reading (same function, same stuck sensors).
  const figures = columnFigures(layersC, tank, tank.latest?.stuck ?? []);
  return {
    id: tank.id,
    serial: tank.serial,
    model: tank.model,
    volumeL: tank.volumeL,
    heightM: tank.heightM,
    sensorCount: tank.sensorCount,
    positionsM: sensorPositions(tank.sensorCount, tank.heightM, tank.sensorHeightsM),
    heatSource: tank.heatSource,
    hpOutputW: tank.hpOutputW,
    immersionRatingW: tank.immersionW,
    targetC: tank.targetC,
    hysteresisK: tank.hysteresisK,
    home: tank.home,
    latest: tank.latest
      ? {
          ts: tank.latest.ts?.toISOString() ?? null,
          lastSeenAt: tank.latest.lastSeenAt?.toISOString() ?? null,
          online: tank.latest.online,
          layersC,
          flowC: tank.latest.flowC,
          returnC: tank.latest.returnC,
          compressor: tank.latest.compressor,
          immersionW: tank.latest.immersionW,
          powerW: tank.latest.powerW,
          drawLpm: tank.latest.drawLpm,
        }
      : null,
    figures,
    toFullKWh: figures?.toFullKWh ?? null,
    status: statusOf(attention.map((a) => a.kind)),
    attention,
    commissioning: {
      commissionedAt: tank.commissionedAt?.toISOString() ?? null,
      heatSource: tank.heatSource,
      targetC: tank.targetC,
      hysteresisK: tank.hysteresisK,
      hpOutputW: tank.hpOutputW,
      immersionRatingW: tank.immersionW,
      sensorCount: tank.sensorCount,
      declaredLossW: tank.declaredLossW,
      declaredClass:
        tank.declaredLossW !== null ? erpClass({ volumeL: tank.volumeL, standingLossW: tank.declaredLossW }) : null,
    },
    analysis,
  };
}
