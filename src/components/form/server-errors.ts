// The one way an API refusal reaches a form: each problem that names a field on the form is shown
// at that field; the server's message, and problems naming no field here, go to the summary.
import type { FieldValues, Path, UseFormReturn } from 'react-hook-form';
import { ApiError } from '../../lib/query/client';

/** The key under `errors.root` that holds the server's refusal. */
export const SERVER_ERROR = 'server';

const OFFLINE_MESSAGE =
  'Could not reach Heatlayer. Your answers are still here; try again when the connection is back.';

/** Dotted names of every value the form holds (nested objects included). */
function names(values: unknown, prefix = ''): string[] {
  if (!values || typeof values !== 'object' || Array.isArray(values)) return prefix ? [prefix] : [];
  return Object.entries(values).flatMap(([k, v]) => {
    const name = prefix ? `${prefix}.${k}` : k;
    return [name, ...(v && typeof v === 'object' && !Array.isArray(v) ? names(v, name) : [])];
  });
}

/**
 * Puts an API error on the form. `prefix` is dropped from the API's field names first (the
 * wizard's "cylinder.volumeL" is the form's "volumeL"); `fieldOf` renames the rest where the
 * form's names differ from the body's.
 */
export function showServerErrors<T extends FieldValues, R extends FieldValues>(
  form: UseFormReturn<T, unknown, R>,
  error: unknown,
  opts: { prefix?: string; fieldOf?: (field: string) => string; offline?: string } = {},
): void {
  if (!(error instanceof ApiError)) {
    form.setError(`root.${SERVER_ERROR}`, { type: 'offline', message: opts.offline ?? OFFLINE_MESSAGE });
    return;
  }
  const known = new Set(names(form.getValues()));
  let rest = 0;
  for (const p of error.fields ?? []) {
    const stripped = opts.prefix && p.field.startsWith(opts.prefix) ? p.field.slice(opts.prefix.length) : p.field;
    const name = opts.fieldOf ? opts.fieldOf(stripped) : stripped;
    if (known.has(name)) form.setError(name as Path<T>, { type: 'server', message: p.message });
    else form.setError(`root.elsewhere${rest++}`, { type: 'server', message: p.message });
  }
  form.setError(`root.${SERVER_ERROR}`, { type: String(error.status), message: error.message });
}
