import type { TankDetail } from '../../lib/views/contracts';
import { heatSourceLabels } from '../../lib/views/labels';

export function CommissioningRecord({ t }: { t: TankDetail }) {
  const c = t.commissioning;
  const rows: [string, string][] = [
    [
      'Commissioned',
      c.commissionedAt
        ? new Date(c.commissionedAt).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric' })
        : 'Not recorded',
    ],
    ['Cylinder', `${t.model}, ${t.volumeL} L, ${t.heightM.toFixed(2)} m tall`],
    ['Sensors', `${c.sensorCount}, bottom to top`],
    ['Heat source', heatSourceLabels[c.heatSource]],
    ['Heat pump output', c.hpOutputW ? `${(c.hpOutputW / 1000).toFixed(1)} kW` : '—'],
    ['Immersion rating', `${(c.immersionRatingW / 1000).toFixed(1)} kW`],
    ['Target temperature', `${c.targetC} °C, reheat ${c.hysteresisK} K below`],
    [
      'Declared standing loss',
      c.declaredLossW !== null ? `${c.declaredLossW} W (class ${c.declaredClass})` : 'Not recorded',
    ],
  ];
  return (
    <section className="card" aria-labelledby="commissioning-title">
      <h3 id="commissioning-title" className="font-semibold">
        Commissioning record
      </h3>
      <dl className="mt-2 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
        {rows.map(([k, v]) => (
          <div key={k} className="flex justify-between gap-3 border-b border-line py-1">
            <dt className="text-ink-muted">{k}</dt>
            <dd className="text-right">{v}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-3 text-xs text-ink-muted">
        Unvented cylinders are safety-critical (expansion, temperature and pressure relief, discharge pipework): service
        work is for a competent, licensed person under local building regulations.
      </p>
    </section>
  );
}
