// Form pieces the commissioning and service forms share: a labelled input with its hint and
// error, wired for screen readers, and the error summary of a refused save.
import type { ReactNode } from 'react';

export type Values = Record<string, unknown>;
export type Errors = Record<string, string>;

interface FieldProps {
  name: string;
  label: string;
  values: Values;
  errors: Errors;
  onChange: (name: string, value: unknown) => void;
  type?: 'text' | 'email' | 'number' | 'tel' | 'date';
  hint?: ReactNode;
  unit?: string;
  step?: string;
  inputMode?: 'numeric' | 'decimal' | 'text' | 'email' | 'tel';
  autoComplete?: string;
  readOnly?: boolean;
}

const idOf = (name: string) => `f-${name.replace(/\W+/g, '-')}`;
const str = (v: unknown) => (v === undefined || v === null ? '' : Array.isArray(v) ? v.join(', ') : String(v));

export function Field({ name, label, values, errors, onChange, type = 'text', hint, unit, step, inputMode, autoComplete, readOnly }: FieldProps) {
  const id = idOf(name);
  const err = errors[name];
  const described = [hint ? `${id}-hint` : '', err ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return (
    <div>
      <label htmlFor={id} className="label">{label}{unit && <span className="font-normal text-ink-muted"> ({unit})</span>}</label>
      <input id={id} name={name} type={type === 'number' ? 'text' : type} inputMode={inputMode ?? (type === 'number' ? 'decimal' : undefined)} step={step}
        autoComplete={autoComplete} readOnly={readOnly} value={str(values[name])} onChange={(e) => onChange(name, e.target.value)}
        aria-invalid={!!err} aria-describedby={described} className={`field ${err ? 'border-brick' : ''} ${readOnly ? 'bg-paper-sunk' : ''}`} />
      {hint && <p id={`${id}-hint`} className="mt-1 text-xs text-ink-muted">{hint}</p>}
      {err && <p id={`${id}-error`} className="mt-1 text-sm text-brick">{err}</p>}
    </div>
  );
}

export function Select({ name, label, values, errors, onChange, options, hint }: Omit<FieldProps, 'type'> & { options: { value: string; label: string }[] }) {
  const id = idOf(name);
  const err = errors[name];
  return (
    <div>
      <label htmlFor={id} className="label">{label}</label>
      <select id={id} name={name} value={str(values[name])} onChange={(e) => onChange(name, e.target.value)} aria-invalid={!!err}
        aria-describedby={err ? `${id}-error` : hint ? `${id}-hint` : undefined} className={`field ${err ? 'border-brick' : ''}`}>
        <option value="">Choose…</option>
        {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
      </select>
      {hint && <p id={`${id}-hint`} className="mt-1 text-xs text-ink-muted">{hint}</p>}
      {err && <p id={`${id}-error`} className="mt-1 text-sm text-brick">{err}</p>}
    </div>
  );
}

export function Check({ name, label, values, errors, onChange }: Omit<FieldProps, 'type'>) {
  const id = idOf(name);
  const err = errors[name];
  return (
    <div>
      <label htmlFor={id} className="flex items-start gap-3 rounded-md border border-line bg-paper-raised p-3 text-sm">
        <input id={id} type="checkbox" checked={values[name] === true} onChange={(e) => onChange(name, e.target.checked)}
          aria-invalid={!!err} aria-describedby={err ? `${id}-error` : undefined} className="mt-0.5 h-5 w-5 accent-tide" />
        <span>{label}</span>
      </label>
      {err && <p id={`${id}-error`} className="mt-1 text-sm text-brick">{err}</p>}
    </div>
  );
}

export function Caution({ title, children }: { title: string; children: ReactNode }) {
  return (
    <aside className="rounded-card border border-ochre bg-ochre-pale p-3 text-sm text-ink" role="note">
      <strong className="font-semibold">{title}</strong> {children}
    </aside>
  );
}

export function Problem({ message, fields }: { message: string; fields?: { field: string; message: string }[] }) {
  return (
    <div role="alert" className="rounded-md border border-brick bg-brick-pale px-3 py-2 text-sm text-brick">
      <p>{message}</p>
      {fields && fields.length > 0 && <ul className="mt-1 list-disc pl-5">{fields.map((f, i) => <li key={i}>{f.message}</li>)}</ul>}
    </div>
  );
}
