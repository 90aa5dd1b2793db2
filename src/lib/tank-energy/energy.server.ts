// Energy, tariffs and planning for the endpoints: load what is stored, hand it to the energy core,
// answer in API shapes. Expected refusals are HttpErrors; the core's own checks stay inside it.
import {
  findEnergyTank,
  findHomeInScope,
  insertTariff,
  lastCompressorStart,
  listEnergyReadings,
  listTariffs,
  tariffsForHome,
  type EnergyTank,
} from '../../db/queries/energy';
import { fleetEnergyFigures, queueDaysForTariff } from '../../db/queries/energy-days';
import { getLatestState } from '../../db/queries/telemetry';
import type { TariffRow } from '../../db/schema';
import { HttpError, requireTank, type Scope } from '../server/authz';
import type { Viewer } from '../server/viewer';
import { sendCommand } from '../telemetry/commands.server';
import { accountDays, readingWindow } from './account';
import {
  HOME_TIME_ZONE,
  type EnergyQuery,
  type EnergyResponse,
  type FleetEnergyQuery,
  type FleetEnergyResponse,
  type PlanBody,
  type PlanResponse,
} from './contracts';
import { fence, outlierRule } from './fleet-outliers';
import { accountingTank, energyReadings, figureGeometry, tankColdC } from './inputs';
import { stuckSensors, tankFigures } from '../thermal';
import { PlanRefusal, planCharge, planInput, shapePlan } from './plan';
import type { TariffProblem } from './tariff-upload';
import type { Tariff } from '../energy';
import { json } from '../server/http';

/** Days of history the planner learns demand from. */
const DEMAND_HISTORY_DAYS = 14;

export async function tankEnergy(scope: Scope, tankId: string | undefined, q: EnergyQuery): Promise<EnergyResponse> {
  const tank = await requireTank(findEnergyTank, scope, tankId);
  const { source, tariffs } = await tariffsForHome(tank.companyId, tank.homeId);
  const w = readingWindow(q.from, q.to, HOME_TIME_ZONE);
  const rows = await listEnergyReadings(tank.id, new Date(w.startMs), new Date(w.endMs));
  const { days, months } = accountDays(
    energyReadings(rows, tank),
    accountingTank(tank),
    tariffs,
    q.from,
    q.to,
    HOME_TIME_ZONE,
    tankColdC(tank),
  );
  const sum = (f: (d: (typeof days)[number]) => number) => days.reduce((a, d) => a + f(d), 0);
  const hpHeat = sum((d) => d.heatPumpHeatKWh);
  const hpElec = sum((d) => d.heatPumpElectricityKWh);
  return {
    from: q.from,
    to: q.to,
    timeZone: HOME_TIME_ZONE,
    homeId: tank.homeId,
    tariffSource: source,
    days,
    months,
    totals: {
      costPence: sum((d) => d.costPence),
      electricityKWh: sum((d) => d.heatPumpElectricityKWh + d.immersionGridElectricityKWh),
      drawnLitres40: sum((d) => d.drawnLitres40),
      heatInKWh: sum((d) => d.heatInKWh),
      dhwCop: hpElec > 0 ? hpHeat / hpElec : null,
      days: days.length,
      solarHeatKWh: sum((d) => d.immersionSolarHeatKWh),
      solarExportForgonePence: sum((d) => d.solarExportForgonePence),
    },
  };
}

/** A plan for the tank from now, or a refusal naming what is missing. */
export async function tankPlan(
  scope: Scope,
  tankId: string | undefined,
  body: PlanBody,
  nowMs = Date.now(),
): Promise<{ tank: EnergyTank; plan: PlanResponse }> {
  const tank = await requireTank(findEnergyTank, scope, tankId);
  const latest = await getLatestState(tank.id);
  const layers = latest?.layersCc;
  if (!layers || layers.length === 0) {
    throw new HttpError(
      409,
      'NoLatestLayers',
      'The tank has not sent its layer temperatures yet, so there is nothing to plan from. Try again once it reports.',
    );
  }
  // The column the figures use: a sensor left out is estimated; withheld figures give no plan.
  const now = tankFigures({ layersC: layers.map((c) => (c === null ? null : c / 100)) }, figureGeometry(tank), {
    stuck: stuckSensors(latest?.sensorCheck),
  });
  if (!now.layersC)
    throw new HttpError(
      409,
      'FiguresWithheld',
      `Temperature sensors in the cylinder are not working, so there is nothing reliable to plan from. ${now.quality.reason}`,
      [{ field: 'layers', message: now.quality.reason ?? 'Figures withheld.' }],
    );
  const { source, tariffs } = await tariffsForHome(tank.companyId, tank.homeId);
  if (source === 'none')
    throw new HttpError(409, 'NoTariff', 'Neither this home nor the company has a tariff: add one before planning.', [
      { field: 'tariff', message: 'No tariff.' },
    ]);
  const history = await listEnergyReadings(
    tank.id,
    new Date(nowMs - DEMAND_HISTORY_DAYS * 86_400_000),
    new Date(nowMs),
  );
  const lastStart = await lastCompressorStart(tank.id);
  try {
    const input = planInput({
      tank,
      layersC: now.layersC,
      history: energyReadings(history, tank),
      tariffs,
      compressor: { running: latest?.compressor === true, lastStartMs: lastStart?.getTime() ?? null },
      nowMs,
      hours: body.hours,
      comfortFloorL40: body.comfortFloorL40,
      timeZone: HOME_TIME_ZONE,
    });
    return { tank, plan: shapePlan(input, planCharge(input), HOME_TIME_ZONE, source) };
  } catch (err) {
    if (err instanceof PlanRefusal)
      throw new HttpError(
        err.code === 'NoTariffInForce' || err.code === 'NotElectricallyHeated' ? 409 : 422,
        err.code,
        err.message,
        [{ field: err.field, message: err.message }],
      );
    throw err;
  }
}

/** Plans, then sends the plan's daily windows to the tank as a set_schedule command. */
export async function sendPlan(viewer: Viewer, scope: Scope, tankId: string | undefined, body: PlanBody) {
  const { tank, plan } = await tankPlan(scope, tankId, body);
  if (plan.windows === null) {
    throw new HttpError(
      409,
      'NothingToSchedule',
      'The plan does not heat the tank in the next 24 hours (it holds enough already), so there is no schedule to send. The tank keeps its current schedule.',
    );
  }
  // The floor travels with the windows, so that the tank heats outside them rather than run short.
  const sent = await sendCommand({
    tank,
    request: { kind: 'set_schedule', windows: plan.windows, comfortFloorL40: plan.comfortFloorL40 },
    actorUserId: viewer.userId,
  });
  return { plan, ...sent };
}

/** Where a new tariff goes: a company default (admins) or one of the viewer's homes (staff). */
export async function tariffOwner(
  viewer: Viewer,
  scope: Scope,
  homeId: string | null | undefined,
): Promise<string | null> {
  if (!homeId) {
    if (viewer.role !== 'admin')
      throw new HttpError(
        403,
        'NotAllowedForRole',
        'Only a company admin sets the company’s default tariffs. Give a homeId to set one home’s tariff.',
      );
    return null;
  }
  if (!(await findHomeInScope(scope, homeId))) throw new HttpError(404, 'HomeNotFound', 'There is no such home.');
  return homeId;
}

/** The 422 answer to a refused tariff: every problem in "fields", CSV ones also in "rows" by line. Nothing is stored. */
export function tariffRefusal(problems: readonly TariffProblem[]): Response {
  const n = problems.length;
  return json(
    {
      error: {
        code: 'TariffRefused',
        message: `The tariff was not stored because of ${n} problem${n === 1 ? '' : 's'} (see "fields"; for a CSV upload "rows" gives each line). Correct them and send it again.`,
        fields: problems.map((p) => ({
          field: p.row === undefined ? p.field : `line ${p.row}: ${p.field}`,
          message: p.message,
        })),
        rows: problems
          .filter((p) => p.row !== undefined)
          .map((p) => ({ row: p.row!, field: p.field, message: p.message })),
      },
    },
    422,
  );
}

/** Stores a validated tariff and answers 201 with it. */
export async function storeTariff(viewer: Viewer, homeId: string | null, tariff: Tariff): Promise<Response> {
  const row = await insertTariff({ companyId: viewer.companyId, homeId, tariff, createdBy: viewer.userId });
  // The stored daily figures of the days it prices are accounted again by the energy-day job.
  await queueDaysForTariff({
    companyId: viewer.companyId,
    homeId,
    validFromMs: tariff.validFromMs,
    validToMs: tariff.validToMs,
    timeZone: HOME_TIME_ZONE,
  });
  return json({ tariff: row }, 201);
}

export async function tariffsVisible(scope: Scope, homeId: string | undefined): Promise<TariffRow[]> {
  if (homeId !== undefined && !(await findHomeInScope(scope, homeId)))
    throw new HttpError(404, 'HomeNotFound', 'There is no such home.');
  return listTariffs(scope.companyId, homeId ?? null);
}

/** The desk's fleet energy figures over local dates, from the stored days (src/db/queries/energy-days.ts). */
export async function fleetEnergy(scope: Scope, q: FleetEnergyQuery): Promise<FleetEnergyResponse> {
  const r = await fleetEnergyFigures(scope.companyId, q.from, q.to, outlierRule);
  const s = r.summary;
  const ratio = (a: number | null, b: number | null, k = 1) => (a !== null && b !== null && b > 0 ? (k * a) / b : null);
  return {
    from: q.from,
    to: q.to,
    timeZone: HOME_TIME_ZONE,
    homes: s.homes,
    homeDays: s.home_days ?? 0,
    averages: {
      costPencePerHomeDay: ratio(s.cost, s.home_days),
      costPencePer100L: ratio(s.cost, s.litres, 100),
      dhwCop: ratio(s.hp_heat, s.hp_elec),
      solarHeatKWh: s.solar ?? 0,
      unpricedKWh: s.unpriced ?? 0,
    },
    fences: { cost_per_100l: fence(s.n_cpl, s.q_cpl), dhw_cop: fence(s.n_cop, s.q_cop) },
    outliers: (r.outliers ?? []).map((o) => ({
      tankId: o.tank_id,
      serial: o.serial,
      homeReference: o.reference,
      town: o.town,
      metric: o.metric,
      value: o.value,
      side: o.side,
      beyondIqr: o.beyond_iqr,
      days: o.days,
    })),
    rule: outlierRule,
  };
}
