// Kinds of service visit (the database enum follows this list).
export const visitKinds = ['annual_inspection', 'fault', 'repair', 'other'] as const;
export type VisitKind = (typeof visitKinds)[number];

export const visitKindLabels: Record<VisitKind, string> = {
  annual_inspection: 'Annual inspection',
  fault: 'Fault call',
  repair: 'Repair',
  other: 'Other visit',
};
