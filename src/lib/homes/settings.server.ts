// Changing a home's cold inlet: the home, its tanks' latest figures (recomputed from their latest
// stored column, so the list, the tank page and the householder see the new figures at once, not
// after the next reading) and the audit entry, in one transaction.
import { db } from '../../db';
import { recordAudit } from '../../db/queries/audit';
import { latestColumnsOfHome, storeLatestFigures, updateColdInlet } from '../../db/queries/home-access';
import { EN16147_COLD_C } from '../thermal';
import { chargeOf } from '../telemetry/writer.server';
import type { Scope } from '../server/authz';

export interface ColdInletChange {
  homeId: string;
  coldInletC: number | null;
  previousC: number | null;
  tanksUpdated: number;
}

/** Null when the home is not the viewer's to change. */
export async function changeColdInlet(
  scope: Scope,
  actorUserId: string,
  homeId: string,
  coldInletC: number | null,
): Promise<ColdInletChange | null> {
  return db().transaction(async (tx) => {
    const changed = await updateColdInlet(tx, scope, homeId, coldInletC);
    if (!changed) return null;
    const columns = await latestColumnsOfHome(tx, homeId);
    let tanksUpdated = 0;
    for (const c of columns) {
      if (!c.layersCc || c.layersCc.length === 0) continue;
      const layersC = c.layersCc.map((v) => (v === null ? null : v / 100));
      await storeLatestFigures(tx, c.tankId, chargeOf({ ...c, coldInletC, stuck: c.sensorCheck ?? null }, layersC));
      tanksUpdated++;
    }
    await recordAudit(
      {
        companyId: scope.companyId,
        actorUserId,
        action: 'home.cold_inlet_changed',
        subject: `home:${homeId}`,
        detail: { fromC: changed.previous, toC: coldInletC, defaultC: EN16147_COLD_C, tanksUpdated },
      },
      tx,
    );
    return { homeId, coldInletC, previousC: changed.previous, tanksUpdated };
  });
}
