// The tank view's time ranges: presets and a custom span, as from/to for the readings API.
export const rangePresets = ['6h', '24h', '7d', '30d'] as const;
export type RangePreset = (typeof rangePresets)[number];
export const presetLabels: Record<RangePreset, string> = {
  '6h': '6 hours',
  '24h': '24 hours',
  '7d': '7 days',
  '30d': '30 days',
};
const presetMs: Record<RangePreset, number> = {
  '6h': 6 * 3_600_000,
  '24h': 86_400_000,
  '7d': 7 * 86_400_000,
  '30d': 30 * 86_400_000,
};

export type RangeChoice = { preset: RangePreset } | { preset: 'custom'; from: number; to: number };

/** from/to in epoch ms; presets end at `now` rounded down to the minute, so polls share a cache key per minute. */
export function rangeBounds(choice: RangeChoice, now: number): { from: number; to: number } {
  if (choice.preset === 'custom') return { from: choice.from, to: choice.to };
  const to = Math.floor(now / 60_000) * 60_000 + 60_000;
  return { from: to - presetMs[choice.preset], to };
}

/** The span an alert opens on: six hours either side of the time its evidence points at (as alert links do). */
export function aroundEvidence(at: number): { from: number; to: number } {
  return { from: at - 6 * 3_600_000, to: at + 6 * 3_600_000 };
}

/** The page's query string for a choice: a custom range is kept in the address (so it can be shared), a preset is not. */
export function rangeSearch(choice: RangeChoice, current: string): string {
  const s = new URLSearchParams(current);
  s.delete('from');
  s.delete('to');
  if (choice.preset === 'custom') {
    s.set('from', new Date(choice.from).toISOString());
    s.set('to', new Date(choice.to).toISOString());
  }
  const qs = s.toString();
  return qs ? `?${qs}` : '';
}
