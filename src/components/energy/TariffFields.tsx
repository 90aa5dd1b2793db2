import { useFormContext } from 'react-hook-form';
import type { TariffForm } from '../../lib/energy/tariff-form';
import { Field, Select } from '../form/fields';

const price = (name: 'import' | 'dayImport' | 'nightImport' | 'export', label: string, unit: string) => (
  <Field name={name} label={label} inputMode="decimal" placeholder={unit === '£/kWh' ? 'e.g. 0.245' : 'e.g. 24.5'} />
);

/** The fields of a flat or day/night tariff, for a home's own and for the company defaults alike. */
export function TariffFields() {
  const { watch } = useFormContext<TariffForm>();
  const [kind, unit] = watch(['kind', 'unit']);
  return (
    <>
      <Select
        name="kind"
        label="Kind"
        choose={null}
        options={[
          { value: 'flat', label: 'Flat (one price)' },
          { value: 'day_night', label: 'Day and night' },
        ]}
      />
      <Field name="name" label="Name" hint="Optional, e.g. the supplier's plan name." maxLength={120} />
      <Select
        name="unit"
        label="Unit"
        choose={null}
        options={[
          { value: 'p/kWh', label: 'p/kWh' },
          { value: '£/kWh', label: '£/kWh' },
        ]}
      />
      {kind === 'flat' ? (
        price('import', 'Import price', unit)
      ) : (
        <>
          {price('dayImport', 'Day import price', unit)}
          {price('nightImport', 'Night import price', unit)}
          <Field name="nightStart" label="Night from" hint="24-hour clock at the home." placeholder="00:30" />
          <Field name="nightEnd" label="Night until" placeholder="05:30" />
        </>
      )}
      {price('export', 'Export price', unit)}
      <Field name="validFrom" label="First day" type="date" hint="From the start of this day at the home." />
      <Field
        name="validTo"
        label="Last day"
        type="date"
        hint="Optional: the last day it applies. Leave empty while it runs on."
      />
    </>
  );
}
