import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from '@/lib/zod';
import { fetchJson } from '../lib/query/client';
import { Field, Form, Saved, Select } from './form/fields';
import { showServerErrors } from './form/server-errors';

/**
 * A form that sends its fields as JSON to one of our endpoints and shows the answer: the
 * message and the failing fields of an error, or a confirmation (or the next page). Every
 * account form uses it, so they all behave the same.
 */
export interface FieldSpec {
  name: string;
  label: string;
  type?: 'text' | 'email' | 'password' | 'select';
  options?: { value: string; label: string }[];
  required?: boolean;
  autoComplete?: string;
  hint?: string;
  defaultValue?: string;
}

interface Props {
  action: string;
  method?: 'POST' | 'PATCH' | 'DELETE';
  fields: FieldSpec[];
  /** Sent with the fields (e.g. a link's token). */
  hidden?: Record<string, string>;
  submitLabel: string;
  /** Shown after success when the answer names no page to go to. */
  successMessage?: string;
  /** Reload the page after success (lists that the change affects). */
  reload?: boolean;
  /** Ask before sending (destructive actions). */
  confirm?: string;
  tone?: 'primary' | 'quiet';
  inline?: boolean;
}

type Values = Record<string, string>;

/** What the browser can check before sending: required fields and the shape of an e-mail address. The server checks the rest. */
function specSchema(fields: FieldSpec[]) {
  return z.object(
    Object.fromEntries(
      fields.map((f) => {
        let s = z.string().trim();
        if (f.required) s = s.min(1, `${f.label} must be given.`);
        const field =
          f.type === 'email'
            ? s.refine(
                (v) => v === '' || /^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(v),
                `${f.label} must be an e-mail address (name@example.com).`,
              )
            : s;
        return [f.name, field];
      }),
    ),
  );
}

export default function JsonForm({
  action,
  method = 'POST',
  fields,
  hidden = {},
  submitLabel,
  successMessage,
  reload,
  confirm,
  tone = 'primary',
  inline,
}: Props) {
  const [done, setDone] = useState<string | null>(null);
  const form = useForm<Values>({
    defaultValues: Object.fromEntries(
      fields.map((f) => [f.name, f.defaultValue ?? (f.type === 'select' ? (f.options?.[0]?.value ?? '') : '')]),
    ),
    resolver: zodResolver(specSchema(fields), undefined, { raw: true }),
  });

  async function submit(values: Values) {
    if (confirm && !window.confirm(confirm)) return;
    setDone(null);
    const body: Record<string, string> = { ...hidden };
    for (const f of fields) if (values[f.name] !== '' || f.required) body[f.name] = values[f.name] ?? '';
    try {
      const answer = await fetchJson<{ message?: string; redirect?: string } | null>(action, {
        method,
        body: method === 'DELETE' ? undefined : JSON.stringify(body),
      });
      if (answer?.redirect) return window.location.assign(answer.redirect);
      if (reload) return window.location.reload();
      form.reset();
      setDone(answer?.message ?? successMessage ?? 'Done.');
    } catch (err) {
      showServerErrors(form, err);
    }
  }

  const button = tone === 'primary' ? 'btn-primary' : 'btn-quiet';
  return (
    <Form
      form={form}
      onSubmit={submit}
      scope={action.replace(/\W+/g, '-')}
      className={inline ? 'flex flex-wrap items-end gap-2' : 'space-y-4'}
    >
      {done && <Saved>{done}</Saved>}
      {fields.map((f) =>
        f.type === 'select' ? (
          <Select
            key={f.name}
            name={f.name}
            label={f.label}
            options={f.options ?? []}
            hint={f.hint}
            choose={null}
            quietLabel={inline}
            className={inline ? '' : undefined}
          />
        ) : (
          <Field
            key={f.name}
            name={f.name}
            label={f.label}
            type={f.type ?? 'text'}
            autoComplete={f.autoComplete}
            hint={f.hint}
            quietLabel={inline}
            className={inline ? '' : undefined}
          />
        ),
      )}
      <button type="submit" disabled={form.formState.isSubmitting} className={`${button} ${inline ? '' : 'w-full'}`}>
        {form.formState.isSubmitting ? 'Sending…' : submitLabel}
      </button>
    </Form>
  );
}
