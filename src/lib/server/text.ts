// What counts as text from outside (query strings, path ids, JSON fields): printable characters,
// tabs and line breaks. PostgreSQL cannot store NUL in text or jsonb, nor half of a UTF-16
// surrogate pair in jsonb, and no form or search ever needs the other control characters.

// C0 controls except tab (09), line feed (0A) and carriage return (0D).
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Why `value` is not acceptable text (a phrase starting "must …"), or null when it is. */
export function textProblem(value: string): string | null {
  const control = CONTROL.exec(value);
  if (control) {
    const code = control[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0');
    return `must not contain control characters (U+${code} at character ${control.index + 1}).`;
  }
  if (LONE_SURROGATE.test(value)) return 'must be well-formed Unicode text.';
  return null;
}
