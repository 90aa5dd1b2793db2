import { useState } from 'react';

interface RowError {
  row: number;
  field: string;
  message: string;
}
interface Preview {
  total: number;
  valid: number;
  errors: RowError[];
}

/** Choose a CSV, see every row's problems, then import the whole file (or nothing). */
export default function InstallsImport() {
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'bad'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function send(path: string): Promise<{ ok: boolean; body: Record<string, unknown> }> {
    const res = await fetch(path, {
      method: 'POST',
      headers: { 'content-type': 'text/csv' },
      body: await file!.text(),
      credentials: 'same-origin',
    });
    return { ok: res.ok, body: await res.json().catch(() => ({})) };
  }

  async function check(f: File | null) {
    setFile(f);
    setPreview(null);
    setMessage(null);
    if (!f) return;
    setBusy(true);
    try {
      const res = await fetch('/api/imports/installs/preview', {
        method: 'POST',
        headers: { 'content-type': 'text/csv' },
        body: await f.text(),
        credentials: 'same-origin',
      });
      const body = await res.json().catch(() => ({}));
      if (res.ok) setPreview(body as Preview);
      else setMessage({ tone: 'bad', text: body.error?.message ?? `The server answered ${res.status}.` });
    } finally {
      setBusy(false);
    }
  }

  async function commit() {
    setBusy(true);
    try {
      const { ok, body } = await send('/api/imports/installs');
      const err = body.error as { message?: string } | undefined;
      setMessage(
        ok
          ? { tone: 'ok', text: `Imported ${body.imported} installs.` }
          : { tone: 'bad', text: err?.message ?? 'The import failed; nothing was stored.' },
      );
      if (ok) setPreview(null);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="card space-y-4">
      <div>
        <label htmlFor="installs-csv" className="label">
          CSV file
        </label>
        <input
          id="installs-csv"
          type="file"
          accept=".csv,text/csv"
          onChange={(e) => check(e.target.files?.[0] ?? null)}
          disabled={busy}
          className="block w-full text-sm file:mr-3 file:rounded-md file:border-0 file:bg-tide file:px-4 file:py-2 file:text-white"
        />
      </div>
      {busy && (
        <p role="status" className="text-sm text-ink-soft">
          Working…
        </p>
      )}
      {message && (
        <p
          role={message.tone === 'bad' ? 'alert' : 'status'}
          className={`rounded-md border px-3 py-2 text-sm ${message.tone === 'bad' ? 'border-brick bg-brick-pale text-brick' : 'border-tide bg-tide-pale text-tide-deep'}`}
        >
          {message.text}
        </p>
      )}
      {preview && (
        <div className="space-y-3" data-preview>
          <p className="text-sm">
            <strong>{preview.total}</strong> rows, <strong>{preview.valid}</strong> ready
            {preview.errors.length ? `, ${new Set(preview.errors.map((e) => e.row)).size} with problems` : ''}.
          </p>
          {preview.errors.length > 0 ? (
            <>
              <p className="text-sm text-brick">
                Fix these rows and choose the file again: nothing is imported while any row has a problem.
              </p>
              <table className="w-full text-left text-sm">
                <thead className="text-ink-muted">
                  <tr>
                    <th className="py-1">Line</th>
                    <th>Column</th>
                    <th>Problem</th>
                  </tr>
                </thead>
                <tbody>
                  {preview.errors.map((e, i) => (
                    <tr key={i} className="border-t border-line" data-error-row={e.row}>
                      <td className="figure py-1">{e.row}</td>
                      <td className="figure">{e.field}</td>
                      <td>{e.message}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </>
          ) : (
            <button type="button" className="btn-primary" onClick={commit} disabled={busy}>
              Import all {preview.total} installs
            </button>
          )}
        </div>
      )}
    </div>
  );
}
