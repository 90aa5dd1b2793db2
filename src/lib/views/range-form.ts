// A custom range on the tank page as typed (two local date-times), checked with the field that is
// wrong named: the range the readings API can serve, at most 62 days. Browser-safe.
import { z } from '@/lib/zod';
import { maxLinkSpanMs } from './contracts';

export const customRangeSchema = z.object({ from: z.string(), to: z.string() }).transform((v, ctx) => {
  const from = Date.parse(v.from);
  const to = Date.parse(v.to);
  if (!Number.isFinite(from)) ctx.addIssue({ code: 'custom', path: ['from'], message: 'Enter a start date and time.' });
  if (!Number.isFinite(to)) ctx.addIssue({ code: 'custom', path: ['to'], message: 'Enter an end date and time.' });
  else if (Number.isFinite(from) && to <= from)
    ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end must be after the start.' });
  else if (to - from > maxLinkSpanMs)
    ctx.addIssue({ code: 'custom', path: ['to'], message: `Choose at most ${maxLinkSpanMs / 86_400_000} days.` });
  return { from, to };
});
