// A short-lived cache of what the ingest side needs to know about tanks, so a fleet sending a
// reading a minute does not cost a lookup a reading. Entries expire after a minute, so a changed
// sensor count or target reaches the writer soon without any invalidation protocol.
import { findIngestTankBySerial, findIngestTankByTokenHash, type IngestTank } from '../../db/queries/telemetry';

const TTL_MS = 60_000;
/** Unknown serials are remembered briefly too, so a misconfigured device cannot hammer the database. */
const MISS_TTL_MS = 10_000;
const MAX_ENTRIES = 200_000;

export class TankDirectory {
  private bySerial = new Map<string, { tank: IngestTank | null; until: number }>();
  private byHash = new Map<string, { tank: IngestTank | null; until: number }>();

  constructor(private readonly lookups = { bySerial: findIngestTankBySerial, byHash: findIngestTankByTokenHash }) {}

  bySerialCached(serial: string): Promise<IngestTank | null> {
    return this.cached(this.bySerial, serial, () => this.lookups.bySerial(serial));
  }

  byTokenHash(hash: string): Promise<IngestTank | null> {
    return this.cached(this.byHash, hash, () => this.lookups.byHash(hash));
  }

  /** Applies a change the pipeline itself made (e.g. a target the tank confirmed). */
  update(serial: string, patch: Partial<IngestTank>): void {
    const hit = this.bySerial.get(serial);
    if (hit?.tank) hit.tank = { ...hit.tank, ...patch };
  }

  /** Forgets everything (after a credential rotation, or in tests). */
  clear(): void {
    this.bySerial.clear();
    this.byHash.clear();
  }

  private async cached(
    map: Map<string, { tank: IngestTank | null; until: number }>,
    key: string,
    load: () => Promise<IngestTank | null>,
  ): Promise<IngestTank | null> {
    const now = Date.now();
    const hit = map.get(key);
    if (hit && hit.until > now) return hit.tank;
    const tank = await load();
    if (map.size >= MAX_ENTRIES) map.clear();
    map.set(key, { tank, until: now + (tank ? TTL_MS : MISS_TTL_MS) });
    return tank;
  }
}
