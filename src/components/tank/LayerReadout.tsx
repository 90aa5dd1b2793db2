import { temperatureColour } from '../../lib/ui/temperature-scale';
import type { ReadingsResponse } from '../../lib/views/contracts';
import { fmtC, fmtL, fmtPct, fmtTime } from '../../lib/views/format';
import { columnAt } from '../../lib/views/series';

/** Every layer's value at the chosen reading, top first, and a slider to move through time by keyboard. */
export function LayerReadout({
  s,
  index,
  onIndex,
}: {
  s: ReadingsResponse;
  index: number;
  onIndex: (i: number) => void;
}) {
  if (index < 0 || index >= s.t.length) return null;
  const column = columnAt(s, index);
  // A reading with temperatures but no figures had them withheld (top sensor or two neighbours out).
  const withheld = s.v40L[index] === null && column.some((c) => c.tempC !== null);
  return (
    <div className="space-y-2">
      <label className="label" htmlFor="heatmap-time">
        Move through time (arrow keys)
      </label>
      <input
        id="heatmap-time"
        type="range"
        className="w-full accent-tide"
        min={0}
        max={s.t.length - 1}
        value={index}
        onChange={(e) => onIndex(Number(e.target.value))}
        aria-valuetext={fmtTime(s.t[index]!)}
      />
      <div aria-live="polite" data-testid="layer-readout">
        <p className="text-sm">
          <span className="font-medium" data-testid="readout-time">
            {fmtTime(s.t[index]!)}
          </span>
          <span className="text-ink-muted">
            {withheld
              ? ' · figures withheld: sensors out'
              : ` · state of charge ${fmtPct(s.soc[index])} · V40 ${fmtL(s.v40L[index])}`}
          </span>
        </p>
        <ol className="mt-1 grid grid-cols-2 gap-x-4 gap-y-0.5 text-sm sm:grid-cols-3 lg:grid-cols-4">
          {column.map((c) => (
            <li key={c.layer} className="flex items-center gap-2" data-layer={c.layer}>
              <span
                aria-hidden="true"
                className="h-3 w-3 shrink-0 rounded-sm border border-line"
                style={{ background: c.tempC === null ? undefined : temperatureColour(c.tempC) }}
              />
              <span className="text-ink-soft">
                Sensor {c.layer} <span className="text-ink-muted">({c.heightM.toFixed(2)} m)</span>
              </span>
              <span className="figure ml-auto">{fmtC(c.tempC)}</span>
            </li>
          ))}
        </ol>
      </div>
    </div>
  );
}
