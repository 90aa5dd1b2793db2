// When a tank's next service is due. An unvented cylinder is inspected once a year (common
// practice, and what manufacturers' warranties usually ask); the year runs from the last annual
// inspection, or from commissioning before the first. Pure.

export const INSPECTION_INTERVAL_MONTHS = 12;
/** How far ahead the desk's list looks for visits coming due. */
export const DUE_SOON_DAYS = 30;

export type DueState = 'overdue' | 'due_soon' | 'not_due';

/** `from` plus whole months, clamped to the month's last day (31 Jan + 1 month = 28/29 Feb). */
export function addMonths(from: Date, months: number): Date {
  const d = new Date(
    Date.UTC(
      from.getUTCFullYear(),
      from.getUTCMonth() + months,
      1,
      from.getUTCHours(),
      from.getUTCMinutes(),
      from.getUTCSeconds(),
    ),
  );
  const last = new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 0)).getUTCDate();
  d.setUTCDate(Math.min(from.getUTCDate(), last));
  return d;
}

export function nextInspectionDue(commissionedAt: Date, lastInspection: Date | null): Date {
  return addMonths(lastInspection ?? commissionedAt, INSPECTION_INTERVAL_MONTHS);
}

export function dueState(due: Date, now = new Date()): DueState {
  if (due.getTime() < now.getTime()) return 'overdue';
  if (due.getTime() - now.getTime() <= DUE_SOON_DAYS * 86_400_000) return 'due_soon';
  return 'not_due';
}

export const dueStateLabels: Record<DueState, string> = {
  overdue: 'Overdue',
  due_soon: 'Due soon',
  not_due: 'Not yet due',
};
