import JsonForm from '../JsonForm';

/** The amendment form of a signed record: which field, its new value, and why. */
export default function AmendmentForm({ id, fields }: { id: string; fields: { value: string; label: string }[] }) {
  return (
    <JsonForm
      action={`/api/commissioning/${id}/amendments`}
      reload
      submitLabel="Record the amendment"
      fields={[
        { name: 'field', label: 'What changes', type: 'select', options: fields, required: true },
        { name: 'value', label: 'New value', required: true },
        { name: 'reason', label: 'Why', required: true },
      ]}
    />
  );
}
