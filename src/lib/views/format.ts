// Numbers and times as people read them (en-GB). Pure, shared by the islands.

export const fmtC = (c: number | null | undefined, digits = 1): string =>
  c === null || c === undefined ? '—' : `${c.toFixed(digits)} °C`;
export const fmtL = (l: number | null | undefined): string =>
  l === null || l === undefined ? '—' : `${Math.round(l)} L`;
export const fmtPct = (x: number | null | undefined): string =>
  x === null || x === undefined ? '—' : `${Math.round(x * 100)} %`;

/** "3 min ago", "2 h ago", "4 days ago". */
export function fmtAgo(iso: string | null | undefined, now: number): string {
  if (!iso) return 'never';
  const s = Math.max(0, Math.round((now - Date.parse(iso)) / 1000));
  if (s < 90) return 'just now';
  if (s < 90 * 60) return `${Math.round(s / 60)} min ago`;
  if (s < 36 * 3600) return `${Math.round(s / 3600)} h ago`;
  return `${Math.round(s / 86400)} days ago`;
}

/** "1 h 20 min", "35 min". */
export function fmtDuration(hours: number): string {
  const mins = Math.max(1, Math.round(hours * 60));
  const h = Math.floor(mins / 60);
  const m = mins % 60;
  return h === 0 ? `${m} min` : m === 0 ? `${h} h` : `${h} h ${m} min`;
}

export const fmtTime = (ms: number): string =>
  new Date(ms).toLocaleString('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });
export const fmtClock = (ms: number): string =>
  new Date(ms).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
