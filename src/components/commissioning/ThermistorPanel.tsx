import { BETA_EQUATION, formatOhm, thermistorWorking } from '../../lib/commissioning/thermistor';
import { ThermalInputError } from '../../lib/thermal/index';

const n = (v: unknown) => (v === '' || v === undefined || v === null ? NaN : Number(String(v).replace(',', '.')));

/** The resistances to set on the controller, worked out with the thermal core as the engineer types. */
export function ThermistorPanel({
  r25Ohm,
  betaK,
  callC,
  satisfiedC,
}: {
  r25Ohm: unknown;
  betaK: unknown;
  callC: unknown;
  satisfiedC: unknown;
}) {
  const input = { sensor: { r25Ohm: n(r25Ohm), betaK: n(betaK) }, callC: n(callC), satisfiedC: n(satisfiedC) };
  if ([input.sensor.r25Ohm, input.sensor.betaK, input.callC, input.satisfiedC].some(Number.isNaN)) {
    return (
      <p className="text-sm text-ink-muted">
        Enter the sensor input’s curve and both temperatures to see the resistances to set.
      </p>
    );
  }
  let working: ReturnType<typeof thermistorWorking>;
  try {
    working = thermistorWorking(input);
  } catch (err) {
    return (
      <p role="alert" className="text-sm text-brick">
        {err instanceof ThermalInputError ? err.message : 'These values cannot be worked out.'}
      </p>
    );
  }
  return (
    <section aria-labelledby="thermistor-title" className="rounded-card border border-tide bg-tide-pale/50 p-4">
      <h3 id="thermistor-title" className="font-semibold">
        Resistances to set on the cylinder controller
      </h3>
      <p className="mt-1 text-xs text-ink-soft">
        Beta equation: <span className="figure">{BETA_EQUATION}</span>; R25 = {formatOhm(working.sensor.r25Ohm)}, B ={' '}
        {working.sensor.betaK} K.
      </p>
      <div className="mt-3 grid gap-4 sm:grid-cols-2">
        {working.lines.map((l) => (
          <div key={l.which} data-setting={l.which}>
            <p className="text-sm text-ink-soft">
              {l.which === 'call' ? 'Call for heat' : 'Satisfied'}: the heat pump reads {l.tempC} °C
            </p>
            <p className="figure text-2xl font-semibold" data-ohm={Math.round(l.ohm)}>
              {formatOhm(l.ohm)}
            </p>
            <ol className="mt-2 space-y-0.5 text-xs text-ink-soft figure">
              {l.working.map((w, i) => (
                <li key={i}>{w}</li>
              ))}
            </ol>
          </div>
        ))}
      </div>
    </section>
  );
}
