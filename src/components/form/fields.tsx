// The one set of form pieces every island uses: a react-hook-form <Form> with its error summary,
// and labelled fields wired for screen readers (hint and error tied to the input by
// aria-describedby). Fields read their value and error from the surrounding form's context.
import { createContext, type ReactNode, useContext, useRef } from 'react';
import {
  type FieldError,
  type FieldErrors,
  type FieldValues,
  FormProvider,
  get,
  type SubmitHandler,
  type UseFormReturn,
  useFormContext,
} from 'react-hook-form';
import { SERVER_ERROR } from './server-errors';

/** The id of a field's input; its hint and error take `-hint` and `-error` after it. */
const fieldId = (name: string, scope = '') => `f-${scope ? `${scope}-` : ''}${name.replace(/\W+/g, '-')}`;

/** A message as it stands beside its field's label: a leading field key ("nightStart must…") is dropped. */
function worded(name: string, message: string): string {
  const key = name.split('.').pop() ?? name;
  const bare = message.startsWith(`${key} `) ? message.slice(key.length + 1) : message;
  return bare.charAt(0).toUpperCase() + bare.slice(1);
}

// Labels by field name, filled as the fields render, so the summary can link to each field by its
// label; and the form's id scope, so two forms on one page never share an id.
const FormContext = createContext<{ labels: Map<string, string>; scope: string }>({ labels: new Map(), scope: '' });

interface FormProps<T extends FieldValues, R extends FieldValues> {
  form: UseFormReturn<T, unknown, R>;
  onSubmit: SubmitHandler<R>;
  children: ReactNode;
  className?: string;
  /** The summary's first line when fields are refused (default: "Not saved. Correct …"). */
  refusal?: string;
  summaryTestId?: string;
  /** Prefix of the fields' ids where one page holds several forms. */
  scope?: string;
}

export function Form<T extends FieldValues, R extends FieldValues>({
  form,
  onSubmit,
  children,
  className,
  refusal,
  summaryTestId,
  scope = '',
}: FormProps<T, R>) {
  // Kept across renders: the summary renders before the fields, which fill it on their first render.
  const labels = useRef(new Map<string, string>()).current;
  return (
    <FormProvider {...form}>
      <FormContext.Provider value={{ labels, scope }}>
        <form method="post" noValidate className={className} onSubmit={form.handleSubmit(onSubmit)}>
          <FormSummary refusal={refusal} testId={summaryTestId} />
          {children}
        </form>
      </FormContext.Provider>
    </FormProvider>
  );
}

/** Every error of a form, flattened to its dotted field name. */
function flatten(errors: FieldErrors, prefix = ''): { name: string; message: string }[] {
  const out: { name: string; message: string }[] = [];
  for (const [key, value] of Object.entries(errors)) {
    if (!value || key === 'root' || key === 'ref') continue;
    const name = prefix ? `${prefix}.${key}` : key;
    const e = value as FieldError;
    if (typeof e.message === 'string' && e.message) out.push({ name, message: e.message });
    else if (typeof value === 'object') out.push(...flatten(value as FieldErrors, name));
  }
  return out;
}

/**
 * What stopped the save: the server's own message or an offline notice, problems that name no
 * field on the form, and a link to each refused field (its message stands beside it, not here).
 */
function FormSummary({ refusal, testId }: { refusal?: string; testId?: string }) {
  const { formState } = useFormContext();
  const { labels, scope } = useContext(FormContext);
  const server = formState.errors.root?.[SERVER_ERROR];
  const all = flatten(formState.errors);
  const onForm = all.filter((e) => labels.has(e.name));
  const elsewhere = all.filter((e) => !labels.has(e.name));
  if (!server && all.length === 0) return null;
  // The server's problems that name no field here sit beside its message under errors.root.
  const extra = Object.entries(formState.errors.root ?? {})
    .filter(
      ([k, e]) =>
        k !== SERVER_ERROR && k !== 'type' && k !== 'message' && typeof (e as FieldError)?.message === 'string',
    )
    .map(([, e]) => String((e as FieldError).message));
  return (
    <div
      role="alert"
      data-testid={testId}
      className="col-span-full w-full rounded-card border border-brick bg-brick-pale p-3 text-sm text-brick"
    >
      <p className="font-semibold">
        {server?.message ??
          refusal ??
          `Not saved. Correct ${onForm.length === 1 ? 'this field' : 'these fields'} and save again.`}
      </p>
      {(onForm.length > 0 || elsewhere.length > 0 || extra.length > 0) && (
        <ul className="mt-1 list-disc pl-5">
          {onForm.map((e) => (
            <li key={e.name}>
              <a className="underline" href={`#${fieldId(e.name, scope)}`}>
                {labels.get(e.name)}
              </a>
            </li>
          ))}
          {[...elsewhere.map((e) => worded(e.name, e.message)), ...extra].map((m, i) => (
            <li key={`m${i}`}>{m}</li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** Registers a field's label for the summary and gives its id, error and describedby. */
function useField(name: string, label: string, hint?: ReactNode) {
  const ctx = useFormContext();
  const { labels, scope } = useContext(FormContext);
  labels.set(name, label);
  const id = fieldId(name, scope);
  const raw = get(ctx.formState.errors, name) as FieldError | undefined;
  const error = typeof raw?.message === 'string' && raw.message ? worded(name, raw.message) : undefined;
  const describedBy = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return { ctx, id, error, describedBy, aria: { 'aria-invalid': !!error, 'aria-describedby': describedBy } };
}

function Below({ id, name, hint, error }: { id: string; name: string; hint?: ReactNode; error?: string }) {
  return (
    <>
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-muted">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm text-brick" data-field-error={name}>
          {error}
        </p>
      )}
    </>
  );
}

interface FieldProps {
  name: string;
  label: string;
  type?: 'text' | 'email' | 'password' | 'number' | 'tel' | 'date' | 'datetime-local';
  hint?: ReactNode;
  unit?: string;
  inputMode?: 'numeric' | 'decimal' | 'text' | 'email' | 'tel';
  autoComplete?: string;
  readOnly?: boolean;
  placeholder?: string;
  maxLength?: number;
  /** Label shown to screen readers only (inline forms). */
  quietLabel?: boolean;
  className?: string;
}

/** A text input; numbers are typed as text (inputMode decimal) so the schema, not the browser, names the problem. */
export function Field({
  name,
  label,
  type = 'text',
  hint,
  unit,
  inputMode,
  autoComplete,
  readOnly,
  placeholder,
  maxLength,
  quietLabel,
  className,
}: FieldProps) {
  const { ctx, id, error, aria } = useField(name, label, hint);
  return (
    <div className={className ?? 'min-w-0'}>
      <label htmlFor={id} className={quietLabel ? 'sr-only' : 'label'}>
        {label}
        {unit && <span className="font-normal text-ink-muted"> ({unit})</span>}
      </label>
      <input
        id={id}
        type={type === 'number' ? 'text' : type}
        inputMode={inputMode ?? (type === 'number' ? 'decimal' : undefined)}
        autoComplete={autoComplete}
        readOnly={readOnly}
        placeholder={placeholder}
        maxLength={maxLength}
        {...aria}
        className={`field ${error ? 'border-brick' : ''} ${readOnly ? 'bg-paper-sunk' : ''}`}
        {...ctx.register(name)}
      />
      <Below id={id} name={name} hint={hint} error={error} />
    </div>
  );
}

export function TextArea({
  name,
  label,
  hint,
  rows = 3,
}: {
  name: string;
  label: string;
  hint?: ReactNode;
  rows?: number;
}) {
  const { ctx, id, error, aria } = useField(name, label, hint);
  return (
    <div>
      <label htmlFor={id} className="label">
        {label}
      </label>
      <textarea
        id={id}
        rows={rows}
        {...aria}
        className={`field ${error ? 'border-brick' : ''}`}
        {...ctx.register(name)}
      />
      <Below id={id} name={name} hint={hint} error={error} />
    </div>
  );
}

interface SelectProps {
  name: string;
  label: string;
  options: readonly { value: string; label: string }[];
  hint?: ReactNode;
  /** The empty first choice; none when every value is a real choice. */
  choose?: string | null;
  quietLabel?: boolean;
  className?: string;
}

export function Select({ name, label, options, hint, choose = 'Choose…', quietLabel, className }: SelectProps) {
  const { ctx, id, error, aria } = useField(name, label, hint);
  return (
    <div className={className ?? 'min-w-0'}>
      <label htmlFor={id} className={quietLabel ? 'sr-only' : 'label'}>
        {label}
      </label>
      <select id={id} {...aria} className={`field ${error ? 'border-brick' : ''}`} {...ctx.register(name)}>
        {choose !== null && <option value="">{choose}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <Below id={id} name={name} hint={hint} error={error} />
    </div>
  );
}

export function Check({ name, label }: { name: string; label: string }) {
  const { ctx, id, error, aria } = useField(name, label);
  return (
    <div>
      <label htmlFor={id} className="flex items-start gap-3 rounded-md border border-line bg-paper-raised p-3 text-sm">
        <input id={id} type="checkbox" {...aria} className="mt-0.5 h-5 w-5 accent-tide" {...ctx.register(name)} />
        <span>{label}</span>
      </label>
      <Below id={id} name={name} error={error} />
    </div>
  );
}

/** A confirmation after a save, announced politely. */
export function Saved({ children, testId }: { children: ReactNode; testId?: string }) {
  return (
    <p
      role="status"
      data-testid={testId}
      className="rounded-md border border-tide bg-tide-pale px-3 py-2 text-sm text-tide-deep"
    >
      {children}
    </p>
  );
}
