import { TEMP_SCALE_MAX_C, TEMP_SCALE_MIN_C, temperatureColour } from '../../lib/ui/temperature-scale';

/** The heatmap's colour scale in °C (cividis, perceptually uniform). */
export function TemperatureLegend() {
  const stops = Array.from(
    { length: 13 },
    (_, i) => TEMP_SCALE_MIN_C + (i * (TEMP_SCALE_MAX_C - TEMP_SCALE_MIN_C)) / 12,
  );
  const ticks = [10, 20, 30, 40, 50, 60, 70];
  return (
    <figure
      className="w-full max-w-md"
      aria-label={`Colour scale from ${TEMP_SCALE_MIN_C} °C (dark blue) to ${TEMP_SCALE_MAX_C} °C (yellow)`}
    >
      <div
        className="h-3 rounded-sm border border-line"
        style={{ background: `linear-gradient(to right, ${stops.map((t) => temperatureColour(t)).join(', ')})` }}
      />
      <div className="relative mt-1 h-4 text-[11px] text-ink-muted">
        {ticks.map((t) => (
          <span
            key={t}
            className="figure absolute -translate-x-1/2"
            style={{ left: `${((t - TEMP_SCALE_MIN_C) / (TEMP_SCALE_MAX_C - TEMP_SCALE_MIN_C)) * 100}%` }}
          >
            {t}
          </span>
        ))}
      </div>
      <figcaption className="text-[11px] text-ink-muted">°C · grey: no reading</figcaption>
    </figure>
  );
}
