import { describe, expect, it } from 'vitest';
import { addMonths, dueState, nextInspectionDue } from '../../../src/lib/commissioning/service-due';

describe('service due dates', () => {
  it('adds calendar months, clamping to the end of a shorter month', () => {
    expect(addMonths(new Date('2025-01-31T10:00:00Z'), 1).toISOString()).toBe('2025-02-28T10:00:00.000Z');
    expect(addMonths(new Date('2024-02-29T10:00:00Z'), 12).toISOString()).toBe('2025-02-28T10:00:00.000Z');
  });

  it('runs the annual inspection from commissioning, then from the last inspection', () => {
    // Annual inspection of unvented cylinders (common practice).
    const commissioned = new Date('2025-03-10T09:00:00Z');
    expect(nextInspectionDue(commissioned, null).toISOString()).toBe('2026-03-10T09:00:00.000Z');
    expect(nextInspectionDue(commissioned, new Date('2026-02-20T09:00:00Z')).toISOString()).toBe(
      '2027-02-20T09:00:00.000Z',
    );
  });

  it('says overdue, due soon or not yet due', () => {
    const now = new Date('2026-06-01T00:00:00Z');
    expect(dueState(new Date('2026-05-31T00:00:00Z'), now)).toBe('overdue');
    expect(dueState(new Date('2026-06-20T00:00:00Z'), now)).toBe('due_soon');
    expect(dueState(new Date('2026-08-01T00:00:00Z'), now)).toBe('not_due');
  });
});
