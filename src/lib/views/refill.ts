// How long until the tank is full again, from the heat still missing and what heats it.
// The heat still missing is the thermal core's `toFullKWh` (tank figures), never computed here.

export interface RefillEstimate {
  state: 'full' | 'heating' | 'waiting' | 'unknown';
  /** Hours of heating still needed at the heat source's rated output; null when unknown. */
  hours: number | null;
  /** Heater used for the estimate. */
  source: 'heat_pump' | 'immersion' | null;
  /** Epoch ms of the expected end, when heating now. */
  readyAt: number | null;
}

/**
 * Time to full at the rated output of the heat source that is running (heat pump first, then
 * the immersion). "Full" within 0.1 kWh of the target (common practice: below what a sensor
 * column resolves). Ignores losses and draws meanwhile, which the page says.
 */
export function refillEstimate(input: {
  toFullKWh: number | null;
  hpOutputW: number;
  immersionRatingW: number;
  compressorOn: boolean | null;
  immersionW: number | null;
  now: number;
}): RefillEstimate {
  const { toFullKWh } = input;
  if (toFullKWh === null) return { state: 'unknown', hours: null, source: null, readyAt: null };
  if (toFullKWh < 0.1) return { state: 'full', hours: 0, source: null, readyAt: null };
  const immersionOn = (input.immersionW ?? 0) > 0;
  const heating = input.compressorOn === true || immersionOn;
  const source =
    input.compressorOn && input.hpOutputW > 0
      ? 'heat_pump'
      : immersionOn
        ? 'immersion'
        : input.hpOutputW > 0
          ? 'heat_pump'
          : input.immersionRatingW > 0
            ? 'immersion'
            : null;
  if (!source) return { state: 'unknown', hours: null, source: null, readyAt: null };
  const kW =
    (source === 'heat_pump' ? input.hpOutputW : immersionOn ? input.immersionW! : input.immersionRatingW) / 1000;
  const hours = toFullKWh / kW;
  return {
    state: heating ? 'heating' : 'waiting',
    hours,
    source,
    readyAt: heating ? input.now + hours * 3_600_000 : null,
  };
}
