import { useMemo } from 'react';
import type uPlot from 'uplot';
import UplotReact from 'uplot-react';
import 'uplot/dist/uPlot.min.css';
import { axis, timeAxis } from './axes';
import { useWidth } from './useWidth';

export interface LineSeries {
  label: string;
  values: (number | null)[];
  colour: string;
  scale?: string;
  width?: number;
  dash?: number[];
}

/** Time-series lines on one or two y scales (uPlot), sized to its container. */
export function LineChart({
  t,
  from,
  to,
  series,
  yLabel,
  y2Label,
  height = 220,
  yRange,
}: {
  t: number[];
  from: number;
  to: number;
  series: LineSeries[];
  yLabel: string;
  y2Label?: string;
  height?: number;
  yRange?: [number, number];
}) {
  const [ref, width] = useWidth<HTMLDivElement>();
  const data = useMemo<uPlot.AlignedData>(() => [t.map((x) => x / 1000), ...series.map((s) => s.values)], [t, series]);
  const options = useMemo<uPlot.Options>(
    () => ({
      width: Math.max(280, width),
      height,
      scales: {
        x: { time: true, range: [from / 1000, to / 1000] },
        y: yRange ? { range: yRange } : { auto: true },
        ...(y2Label ? { y2: { auto: true } } : {}),
      },
      axes: [
        timeAxis(to - from),
        axis({ label: yLabel, size: 50 }),
        ...(y2Label ? [axis({ label: y2Label, scale: 'y2', side: 1, grid: { show: false }, size: 50 })] : []),
      ],
      series: [
        {
          label: 'Time',
          value: (_u, v) =>
            v === null
              ? '—'
              : new Date(v * 1000).toLocaleString('en-GB', {
                  day: 'numeric',
                  month: 'short',
                  hour: '2-digit',
                  minute: '2-digit',
                }),
        },
        ...series.map((s) => ({
          label: s.label,
          stroke: s.colour,
          width: s.width ?? 1.5,
          scale: s.scale ?? 'y',
          dash: s.dash,
          spanGaps: false,
          points: { show: false },
        })),
      ],
      cursor: { drag: { x: false, y: false } },
      legend: { live: true },
    }),
    [width, height, from, to, series, yLabel, y2Label, yRange],
  );
  return (
    <div ref={ref} className="w-full min-w-0 overflow-hidden text-xs">
      {width > 0 && <UplotReact options={options} data={data} />}
    </div>
  );
}
