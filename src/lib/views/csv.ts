// The shown range as CSV: one row per reading or bucket, layers bottom to top.
import type { ReadingsResponse } from './contracts';

const cell = (v: number | null | undefined, digits: number): string =>
  v === null || v === undefined ? '' : v.toFixed(digits);

export function readingsCsv(s: ReadingsResponse, serial: string): string {
  const layerHeads = Array.from({ length: s.sensorCount }, (_, k) => `layer_${k + 1}_c`);
  const head = [
    'time_utc',
    ...layerHeads,
    'state_of_charge',
    'v40_l',
    s.resolution === 'raw' ? 'compressor_on' : 'compressor_share',
    s.resolution === 'raw' ? 'immersion_on' : 'immersion_share',
    'draw_l_per_min',
    'flow_c',
  ];
  const lines = [
    `# tank ${serial}; ${s.from} to ${s.to}; resolution ${s.resolution}; layers bottom to top in °C`,
    head.join(','),
  ];
  for (let i = 0; i < s.t.length; i++) {
    lines.push(
      [
        new Date(s.t[i]!).toISOString(),
        ...s.layers.map((l) => cell(l[i], 2)),
        cell(s.soc[i], 4),
        cell(s.v40L[i], 1),
        cell(s.compressor[i], 3),
        cell(s.immersion[i], 3),
        cell(s.drawLpm[i], 1),
        cell(s.flowC[i], 2),
      ].join(','),
    );
  }
  return `${lines.join('\r\n')}\r\n`;
}
