// JSON responses in one shape, so every endpoint answers errors the same way.
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', ...headers },
  });
}

export interface FieldError {
  field: string;
  message: string;
}

/** An error answer: a permanent PascalCase code, a sentence for people, and optional field details. */
export function problem(status: number, code: string, message: string, fields?: FieldError[]): Response {
  return json({ error: { code, message, ...(fields ? { fields } : {}) } }, status);
}
