// Request schemas of the alert endpoints, shared by the islands and the endpoints. Pure: no I/O.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { alertKinds, alertSeverities, alertStates } from './types';

const opt = <T extends z.ZodTypeAny>(s: T) => z.preprocess((v) => (v === '' ? undefined : v), s.optional());

export const alertListQuerySchema = z.object({
  kind: opt(z.enum(alertKinds, { error: `kind must be one of ${alertKinds.join(', ')}.` })),
  severity: opt(z.enum(alertSeverities, { error: 'severity must be critical, warning or info.' })),
  state: opt(
    z.enum([...alertStates, 'active'] as [string, ...string[]], {
      error: 'state must be active, open, acknowledged or resolved.',
    }),
  ),
  assignee: opt(z.string().max(100, 'assignee is too long.')),
  town: opt(z.string().max(100, 'town is too long.')),
  tankId: opt(z.string().uuid('tankId must be a tank id.')),
  page: opt(
    z.coerce
      .number({ error: 'page must be a number.' })
      .int('page must be a whole number.')
      .min(1, 'page must be 1 or more.')
      .max(10_000, 'page is too large.'),
  ),
});
export type AlertListQuery = z.infer<typeof alertListQuerySchema>;

const note = z
  .string()
  .trim()
  .max(2000, 'note must be at most 2000 characters.')
  .optional()
  .transform((v) => (v ? v : null));

export const acknowledgeSchema = z.object({
  ids: z
    .array(
      z.string().uuid('each id must be an alert id.'),
      messages('ids is required.', 'ids must be a list of alert ids.'),
    )
    .min(1, 'Choose at least one alert.')
    .max(500, 'At most 500 alerts at a time.'),
  note,
});

export const alertActionSchema = z.discriminatedUnion(
  'action',
  [
    z.object({ action: z.literal('resolve'), note }),
    z.object({
      action: z.literal('assign'),
      assigneeId: z
        .string()
        .min(1, 'assigneeId must name a person.')
        .max(100, 'assigneeId must name a person.')
        .nullable(),
    }),
  ],
  { error: 'action must be resolve or assign.' },
);

export const noticePreferenceSchema = z.object({
  householderNotices: z.boolean(
    messages('householderNotices is required.', 'householderNotices must be true or false.'),
  ),
});
