/** A `next` address from the query string, kept only if it is a path on this site (no open redirect). */
export function safeNextPath(value: string | null | undefined, fallback = '/'): string {
  if (!value?.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return fallback;
  return value;
}
