// A custom span for the tank page as two local date-times, through the one form path. RangePicker
// loads it only when "Custom" is chosen, so the tank page's script stays within its budget.
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { customRangeSchema } from '../../lib/views/range-form';
import { Field, Form } from '../form/fields';

const toLocalInput = (ms: number) =>
  new Date(ms - new Date(ms).getTimezoneOffset() * 60_000).toISOString().slice(0, 16);

export default function CustomRangeForm({
  bounds,
  onShow,
}: {
  bounds: { from: number; to: number };
  onShow: (r: { from: number; to: number }) => void;
}) {
  const form = useForm<{ from: string; to: string }, unknown, { from: number; to: number }>({
    defaultValues: { from: toLocalInput(bounds.from), to: toLocalInput(bounds.to) },
    resolver: zodResolver(customRangeSchema),
  });
  return (
    <Form
      form={form}
      scope="range"
      className="flex flex-wrap items-start gap-2"
      refusal="Not shown. Correct the range and try again."
      onSubmit={onShow}
    >
      <Field name="from" label="From" type="datetime-local" className="min-w-0" />
      <Field name="to" label="To" type="datetime-local" className="min-w-0" />
      <button type="submit" className="btn-primary mt-6 py-1.5">
        Show
      </button>
    </Form>
  );
}
