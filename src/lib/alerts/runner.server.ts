// Where alerts meet the running product: the ingest worker calls evaluateOnBatch() with the topics
// of every batch it has committed (the rules then read just those tanks' new readings), and runs
// an AlertClock for the rules that move with time (offline, the legionella window), readings that
// arrived another way (HTTP ingest), and the e-mails.
import { tankIdsBySerial, tanksForClock } from '../../db/queries/alerts';
import { evaluateTankClock, evaluateTankReadings, type AppliedTransition } from './evaluate.server';
import { parseTopic } from '../telemetry/wire';
import { sendDigests, sendHouseholderNotices, sendSevereNotices } from './notify';

const idsBySerial = new Map<string, string>();

/** Tank ids for the telemetry topics of a committed batch (cached: serials do not change owner). */
async function tankIdsOf(topics: readonly string[]): Promise<string[]> {
  const serials = new Set<string>();
  for (const t of topics) {
    const p = parseTopic(t);
    if (p?.channel === 'telemetry') serials.add(p.serial);
  }
  const unknown = [...serials].filter((s) => !idsBySerial.has(s));
  if (unknown.length) {
    for (const t of await tankIdsBySerial(unknown)) idsBySerial.set(t.serial, t.id);
  }
  return [...serials].flatMap((s) => (idsBySerial.has(s) ? [idsBySerial.get(s)!] : []));
}

/** Evaluates the rules for these tanks' new readings, one tank after another. */
export async function evaluateTanks(tankIds: Iterable<string>): Promise<AppliedTransition[]> {
  const out: AppliedTransition[] = [];
  for (const id of tankIds) out.push(...(await evaluateTankReadings(id)));
  return out;
}

/**
 * Evaluation after committed batches: tanks queue up while an evaluation runs and are taken
 * together next (a busy tank is evaluated once for many batches). Never throws into the worker.
 */
export class BatchEvaluator {
  private dirty = new Set<string>();
  private running: Promise<void> | null = null;
  constructor(private readonly log: (line: string) => void = console.log) {}

  /** The ingest worker's hook: call with the topics of a committed batch. */
  evaluateOnBatch(topics: readonly string[]): void {
    void tankIdsOf(topics)
      .then((ids) => {
        for (const id of ids) this.dirty.add(id);
        this.kick();
      })
      .catch((err) =>
        this.log(`[alerts] could not look up tanks of a batch: ${err instanceof Error ? err.message : String(err)}`),
      );
  }

  /** Resolves when everything queued so far has been evaluated. */
  async idle(): Promise<void> {
    while (this.running) await this.running;
  }

  private kick(): void {
    if (this.running || this.dirty.size === 0) return;
    this.running = (async () => {
      while (this.dirty.size > 0) {
        const ids = [...this.dirty];
        this.dirty.clear();
        for (const id of ids) {
          try {
            await evaluateTankReadings(id);
          } catch (err) {
            this.dirty.add(id); // its readings stay unevaluated; try again with the next batch or tick
            this.log(
              `[alerts] evaluation of tank ${id} failed (will retry): ${err instanceof Error ? err.message : String(err)}`,
            );
            await new Promise((r) => setTimeout(r, 1000));
          }
        }
      }
    })().finally(() => {
      this.running = null;
    });
  }
}

/**
 * One turn of the clock: catch up tanks with unevaluated readings, run the time-based rules for
 * every tank that has reported, then send what is due. `now` is a fixed time (epoch ms; tests turn
 * the clock on simulated time) or, on the real clock, `Date.now`: a turn over a large fleet during
 * a backfill takes minutes, and each tank must be judged at the moment it is looked at, or a tank
 * heard during the turn would look silent since its newest (old) reading.
 */
export async function runClock(
  now: number | (() => number),
  opts: { companyId?: string; log?: (line: string) => void } = {},
): Promise<{ transitions: AppliedTransition[]; mails: number }> {
  const log = opts.log ?? console.log;
  const transitions: AppliedTransition[] = [];
  for (const t of await tanksForClock(opts.companyId)) {
    if (t.behind) transitions.push(...(await evaluateTankReadings(t.id)));
    transitions.push(...(await evaluateTankClock(t.id, now)));
  }
  const at = typeof now === 'function' ? now() : now;
  const mails =
    (await sendSevereNotices(at, log)) +
    (await sendHouseholderNotices(at, log)) +
    (await sendDigests(at, log, { companyId: opts.companyId }));
  return { transitions, mails };
}

/** Runs the clock every `intervalMs` on the real time. */
export class AlertClock {
  private timer: NodeJS.Timeout | null = null;
  private busy = false;
  constructor(
    private readonly intervalMs: number,
    private readonly log: (line: string) => void = console.log,
  ) {}

  start(): void {
    if (this.intervalMs <= 0) return;
    this.timer = setInterval(() => {
      if (this.busy) return; // a slow turn is skipped rather than piled up
      this.busy = true;
      runClock(Date.now, { log: this.log })
        .catch((err) =>
          this.log(`[alerts] clock turn failed (will retry): ${err instanceof Error ? err.message : String(err)}`),
        )
        .finally(() => {
          this.busy = false;
        });
    }, this.intervalMs);
  }

  stop(): void {
    if (this.timer) clearInterval(this.timer);
  }
}
