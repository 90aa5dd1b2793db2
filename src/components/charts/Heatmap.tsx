import { useEffect, useMemo, useRef } from 'react';
import uPlot from 'uplot';
import UplotReact from 'uplot-react';
import 'uplot/dist/uPlot.min.css';
import { temperatureColour } from '../../lib/ui/temperature-scale';
import type { ReadingsResponse } from '../../lib/views/contracts';
import { cellSpans, stepMs } from '../../lib/views/series';
import { axis, timeAxis } from './axes';
import { tokens } from './tokens';
import { useWidth } from './useWidth';

// 0.5 K steps from 0 to 100 °C: one colour lookup per cell instead of an interpolation.
const palette = Array.from({ length: 201 }, (_, i) => temperatureColour(i / 2));
const colourOf = (c: number) => palette[Math.max(0, Math.min(200, Math.round(c * 2)))]!;

/** Bottom and top of the water each sensor stands for, metres. */
function layerBounds(positions: readonly number[], heightM: number): { lower: number; upper: number }[] {
  return positions.map((p, k) => ({
    lower: k === 0 ? 0 : (positions[k - 1]! + p) / 2,
    upper: k === positions.length - 1 ? heightM : (p + positions[k + 1]!) / 2,
  }));
}

/**
 * Height (y) against time (x), each cell coloured by its layer's temperature. The cursor (mouse,
 * touch, or the keyboard slider the parent renders) picks a reading; `onIndex` reports it.
 */
export function Heatmap({
  s,
  heightM,
  selected,
  onIndex,
}: {
  s: ReadingsResponse;
  heightM: number;
  selected: number;
  onIndex: (i: number) => void;
}) {
  const [ref, width] = useWidth<HTMLDivElement>();
  const selectedRef = useRef(selected);
  selectedRef.current = selected;
  const onIndexRef = useRef(onIndex);
  onIndexRef.current = onIndex;
  const chartRef = useRef<uPlot | null>(null);
  // biome-ignore lint/correctness/useExhaustiveDependencies: the draw hook reads the selection from a ref; a new selection only asks for a redraw
  useEffect(() => {
    chartRef.current?.redraw(false, false);
  }, [selected]);

  const data = useMemo<uPlot.AlignedData>(() => [s.t.map((t) => t / 1000), s.t.map(() => heightM / 2)], [s, heightM]);
  const options = useMemo<uPlot.Options>(() => {
    const bounds = layerBounds(s.positionsM, heightM);
    const cells = cellSpans(s.t, stepMs(s.resolution) * 3);
    const draw = (u: uPlot) => {
      const ctx = u.ctx;
      const { left, top, width: w, height: h } = u.bbox;
      ctx.save();
      ctx.beginPath();
      ctx.rect(left, top, w, h);
      ctx.clip();
      ctx.fillStyle = tokens.line.DEFAULT;
      ctx.fillRect(left, top, w, h);
      const ys = bounds.map((b) => [u.valToPos(b.upper, 'y', true), u.valToPos(b.lower, 'y', true)] as const);
      for (let i = 0; i < s.t.length; i++) {
        const x0 = u.valToPos(cells[i]!.from / 1000, 'x', true);
        const x1 = u.valToPos(cells[i]!.to / 1000, 'x', true);
        if (x1 < left || x0 > left + w) continue;
        for (let k = 0; k < s.layers.length; k++) {
          const v = s.layers[k]![i];
          if (v === null || v === undefined) continue;
          ctx.fillStyle = colourOf(v);
          ctx.fillRect(x0, ys[k]![0], Math.max(1, x1 - x0 + 0.6), ys[k]![1] - ys[k]![0] + 0.6);
        }
      }
      const sel = selectedRef.current;
      if (sel >= 0 && sel < s.t.length) {
        const x = u.valToPos(s.t[sel]! / 1000, 'x', true);
        ctx.strokeStyle = tokens.paper.raised;
        ctx.lineWidth = 2 * uPlot.pxRatio;
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + h);
        ctx.stroke();
        ctx.strokeStyle = tokens.ink.DEFAULT;
        ctx.lineWidth = 1 * uPlot.pxRatio;
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + h);
        ctx.stroke();
      }
      ctx.restore();
    };
    const span = s.t.length ? s.t[s.t.length - 1]! - s.t[0]! : 0;
    return {
      width: Math.max(280, width),
      height: 260,
      scales: {
        x: { time: true, range: [Date.parse(s.from) / 1000, Date.parse(s.to) / 1000] },
        y: { range: [0, heightM] },
      },
      axes: [
        timeAxis(span),
        axis({ label: 'Height above bottom (m)', values: (_u, splits) => splits.map((v) => v.toFixed(1)), size: 50 }),
      ],
      series: [{}, { label: 'cursor', paths: () => null, points: { show: false }, stroke: 'transparent' }],
      legend: { show: false },
      cursor: { y: false, points: { show: false }, drag: { x: false, y: false } },
      hooks: {
        draw: [draw],
        setCursor: [
          (u) => {
            if (u.cursor.idx !== null && u.cursor.idx !== undefined) onIndexRef.current(u.cursor.idx);
          },
        ],
      },
    };
  }, [s, heightM, width]);

  return (
    <div ref={ref} className="w-full min-w-0 overflow-hidden" aria-hidden="true">
      {width > 0 && (
        <UplotReact
          options={options}
          data={data}
          onCreate={(u) => {
            chartRef.current = u;
          }}
          onDelete={() => {
            chartRef.current = null;
          }}
        />
      )}
    </div>
  );
}
