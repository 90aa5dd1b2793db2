// Plain-language notices for the householder: no trade terms, each says what happens next.
import type { TankDetail } from './contracts';

export interface Notice {
  tone: 'info' | 'warn';
  text: string;
}

export function householdNotices(t: Pick<TankDetail, 'attention' | 'analysis' | 'latest'>): Notice[] {
  const out: Notice[] = [];
  const kinds = new Set(t.attention.map((a) => a.kind));
  if (kinds.has('offline'))
    out.push({
      tone: 'warn',
      text: 'Your cylinder has not been in touch for a while, so these figures may be out of date. Check that its controller has power and your internet is working; we have been told.',
    });
  if (kinds.has('legionella_risk'))
    out.push({
      tone: 'warn',
      text: 'Your hot water was not hot enough this week to keep bacteria under control. We have been told and will be in touch about a higher temperature or a weekly hot cycle.',
    });
  if (kinds.has('sensor_fault'))
    out.push({
      tone: 'info',
      text: 'One of the temperature sensors in your cylinder is not working properly, so the amounts shown may be less exact. We have been told.',
    });
  if (kinds.has('short_cycling'))
    out.push({
      tone: 'info',
      text: 'Your heat pump is switching on and off more often than it should, which wears it out. We have been told and may arrange a visit.',
    });
  if (kinds.has('immersion_heavy'))
    out.push({
      tone: 'info',
      text: 'The electric heater in your cylinder has been doing much of the heating lately, which costs more than the heat pump. We have been told.',
    });
  if (kinds.has('heat_loss'))
    out.push({
      tone: 'info',
      text: 'Your cylinder seems to be losing heat faster than it should when nobody uses hot water, which wastes energy. We have been told and may check its insulation and pipes.',
    });
  if (kinds.has('low_hot_water'))
    out.push({ tone: 'info', text: 'Hot water is low right now. If you need it soon, use the button to heat it now.' });
  return out;
}
