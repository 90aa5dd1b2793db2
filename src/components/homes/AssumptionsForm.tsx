// The householder's own shower and bath sizes, kept on this phone, through the one form path.
// HomeHotWater loads it only when "How we count showers and baths" is opened, so /home stays light.
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { assumptionsSchema, type AssumptionsTyped, BATH_L, SHOWER_L } from '../../lib/views/assumptions-form';
import { Field, Form, Saved } from '../form/fields';

interface Assumptions {
  showerL: number;
  bathL: number;
}
const typed = (a: Assumptions): AssumptionsTyped => ({ showerL: String(a.showerL), bathL: String(a.bathL) });

export default function AssumptionsForm({
  value,
  standard,
  onSave,
}: {
  value: Assumptions;
  standard: Assumptions;
  onSave: (a: Assumptions) => void;
}) {
  const form = useForm<AssumptionsTyped, unknown, Assumptions>({
    defaultValues: typed(value),
    resolver: zodResolver(assumptionsSchema),
  });
  const [saved, setSaved] = useState(false);
  // The saved sizes become the form's own, so "Saved" shows until the next edit.
  const save = (a: Assumptions) => {
    onSave(a);
    form.reset(typed(a));
    setSaved(true);
  };
  return (
    <Form
      form={form}
      scope="home"
      className="mt-2 grid grid-cols-2 gap-3"
      refusal="Not changed. Correct the sizes and save again."
      onSubmit={save}
    >
      <Field name="showerL" label="Litres per shower" inputMode="decimal" hint={`${SHOWER_L.min} to ${SHOWER_L.max}`} />
      <Field name="bathL" label="Litres per bath" inputMode="decimal" hint={`${BATH_L.min} to ${BATH_L.max}`} />
      <button type="submit" className="btn-primary">
        Save
      </button>
      <button type="button" className="btn-quiet" onClick={() => save(standard)}>
        Use standard sizes
      </button>
      {saved && !form.formState.isDirty && (
        <div className="col-span-2">
          <Saved testId="assumptions-saved">Saved on this phone.</Saved>
        </div>
      )}
    </Form>
  );
}
