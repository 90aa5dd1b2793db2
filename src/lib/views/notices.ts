// Plain-language notices for the householder: no trade terms, each says what happens next.
import type { AttentionItem, TankDetail } from './contracts';

export interface Notice {
  tone: 'info' | 'warn';
  text: string;
}

/** The notice of each kind of alert a household hears about, in the order they are shown. */
const noticeOf = {
  offline: {
    tone: 'warn',
    text: 'Your cylinder has not been in touch for a while, so these figures may be out of date. Check that its controller has power and your internet is working; we have been told.',
  },
  legionella_risk: {
    tone: 'warn',
    text: 'Your hot water was not hot enough this week to keep bacteria under control. We have been told and will be in touch about a higher temperature or a weekly hot cycle.',
  },
  sensor_fault: {
    tone: 'info',
    text: 'One of the temperature sensors in your cylinder is not working properly, so the amounts shown may be less exact. We have been told.',
  },
  short_cycling: {
    tone: 'info',
    text: 'Your heat pump is switching on and off more often than it should, which wears it out. We have been told and may arrange a visit.',
  },
  immersion_heavy: {
    tone: 'info',
    text: 'The electric heater in your cylinder has been doing much of the heating lately, which costs more than the heat pump. We have been told.',
  },
  heat_loss: {
    tone: 'info',
    text: 'Your cylinder seems to be losing heat faster than it should when nobody uses hot water, which wastes energy. We have been told and may check its insulation and pipes.',
  },
  low_hot_water: {
    tone: 'info',
    text: 'Hot water is low right now. If you need it soon, use the button to heat it now.',
  },
} satisfies Partial<Record<AttentionItem['kind'], Notice>>;

export function householdNotices(t: Pick<TankDetail, 'attention' | 'analysis' | 'latest'>): Notice[] {
  const kinds = new Set(t.attention.map((a) => a.kind));
  return (Object.keys(noticeOf) as (keyof typeof noticeOf)[]).filter((k) => kinds.has(k)).map((k) => noticeOf[k]);
}
