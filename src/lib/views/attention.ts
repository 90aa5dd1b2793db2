// What makes a tank need a person, in the order the desk should deal with it. The views decide
// nothing themselves: a tank needs attention for each alert the rules (src/lib/alerts) raised and
// nobody has resolved, so the fleet list, the tank page and the alert inbox always agree. Pure.
import { alertKinds, alertLabels, type AlertKind } from '../alerts/types';

/** Every alert kind, most urgent first (the desk's order, not the inbox's severity order). */
export const attentionKinds = alertKinds;
export type AttentionKind = AlertKind;

/** The inbox's labels, so both pages name a problem the same way. */
export const attentionLabels: Record<AttentionKind, string> = alertLabels;

/** Lower is more urgent: the order in which the desk should act. */
export const attentionPriority: Record<AttentionKind, number> = Object.fromEntries(
  attentionKinds.map((k, i) => [k, i]),
) as Record<AttentionKind, number>;

/** Overall status of a tank for the table's status filter. */
export type TankStatus = 'offline' | 'attention' | 'ok';
export const tankStatuses = ['offline', 'attention', 'ok'] as const;
export function statusOf(kinds: readonly AttentionKind[]): TankStatus {
  if (kinds.includes('offline')) return 'offline';
  return kinds.length > 0 ? 'attention' : 'ok';
}

/** Kinds in the desk's order (the most urgent first), without repeats. */
export function byUrgency(kinds: readonly AttentionKind[]): AttentionKind[] {
  return [...new Set(kinds)].sort((a, b) => attentionPriority[a] - attentionPriority[b]);
}
