import { useState, type FormEvent } from 'react';

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

interface Problem { error?: { message?: string; fields?: { field: string; message: string }[] }; message?: string; redirect?: string }

export default function JsonForm({ action, method = 'POST', fields, hidden = {}, submitLabel, successMessage, reload, confirm, tone = 'primary', inline }: Props) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const [done, setDone] = useState<string | null>(null);

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (confirm && !window.confirm(confirm)) return;
    const form = e.currentTarget;
    const body: Record<string, string> = { ...hidden };
    for (const f of fields) {
      const v = (form.elements.namedItem(f.name) as HTMLInputElement | HTMLSelectElement | null)?.value ?? '';
      if (v !== '' || f.required) body[f.name] = v;
    }
    setBusy(true); setError(null); setFieldErrors({}); setDone(null);
    try {
      const res = await fetch(action, { method, headers: { 'content-type': 'application/json' }, body: method === 'DELETE' ? undefined : JSON.stringify(body) });
      const answer: Problem = res.status === 204 ? {} : await res.json().catch(() => ({}));
      if (!res.ok) {
        setError(answer.error?.message ?? `The server answered ${res.status}. Please try again.`);
        setFieldErrors(Object.fromEntries((answer.error?.fields ?? []).map((f) => [f.field, f.message])));
        return;
      }
      if (answer.redirect) { window.location.assign(answer.redirect); return; }
      if (reload) { window.location.reload(); return; }
      form.reset();
      setDone(answer.message ?? successMessage ?? 'Done.');
    } catch {
      setError('Could not reach Heatlayer. Check your connection and try again.');
    } finally {
      setBusy(false);
    }
  }

  const button = tone === 'primary' ? 'btn-primary' : 'btn-quiet';
  return (
    <form method="post" onSubmit={submit} noValidate className={inline ? 'flex flex-wrap items-end gap-2' : 'space-y-4'}>
      {error && <p role="alert" className="w-full rounded-md border border-brick bg-brick-pale px-3 py-2 text-sm text-brick">{error}</p>}
      {done && <p role="status" className="w-full rounded-md border border-tide bg-tide-pale px-3 py-2 text-sm text-tide-deep">{done}</p>}
      {fields.map((f) => {
        const id = `${action.replace(/\W+/g, '-')}-${f.name}`;
        const err = fieldErrors[f.name];
        const describedBy = [f.hint ? `${id}-hint` : '', err ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
        return (
          <div key={f.name} className={inline ? '' : undefined}>
            <label htmlFor={id} className={inline ? 'sr-only' : 'label'}>{f.label}</label>
            {f.type === 'select' ? (
              <select id={id} name={f.name} defaultValue={f.defaultValue} required={f.required} aria-invalid={!!err} aria-describedby={describedBy} className="field">
                {f.options?.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
              </select>
            ) : (
              <input id={id} name={f.name} type={f.type ?? 'text'} defaultValue={f.defaultValue} required={f.required} autoComplete={f.autoComplete}
                aria-invalid={!!err} aria-describedby={describedBy} className="field" />
            )}
            {f.hint && <p id={`${id}-hint`} className="mt-1 text-xs text-ink-muted">{f.hint}</p>}
            {err && <p id={`${id}-error`} className="mt-1 text-sm text-brick">{err}</p>}
          </div>
        );
      })}
      <button type="submit" disabled={busy} className={`${button} ${inline ? '' : 'w-full'}`}>{busy ? 'Sending…' : submitLabel}</button>
    </form>
  );
}
