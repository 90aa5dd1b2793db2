import { useRef, useState } from 'react';

export interface UploadItem {
  id: string;
  kind: 'photo' | 'document';
  filename: string;
  bytes: number;
  url: string;
}

/** Uploads photos and documents one by one; each refusal says what was wrong with which file. */
export function UploadPanel({
  target,
  initial = [],
  onChange,
}: {
  target: { commissioningId: string } | { tankId: string };
  initial?: UploadItem[];
  onChange?: (items: UploadItem[]) => void;
}) {
  const [items, setItems] = useState<UploadItem[]>(initial);
  const [errors, setErrors] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  async function send(files: FileList | null) {
    if (!files?.length) return;
    setBusy(true);
    setErrors([]);
    const added: UploadItem[] = [];
    const problems: string[] = [];
    for (const file of Array.from(files)) {
      const form = new FormData();
      form.set('file', file);
      for (const [k, v] of Object.entries(target)) form.set(k, v);
      try {
        const res = await fetch('/api/uploads', { method: 'POST', body: form, credentials: 'same-origin' });
        const body = await res.json().catch(() => ({}));
        if (res.ok) added.push(body.upload);
        else problems.push(body.error?.message ?? `${file.name}: the server answered ${res.status}.`);
      } catch {
        problems.push(`${file.name}: could not reach Heatlayer. Check the connection and try again.`);
      }
    }
    const next = [...items, ...added];
    setItems(next);
    setErrors(problems);
    setBusy(false);
    onChange?.(next);
    if (input.current) input.current.value = '';
  }

  return (
    <div className="space-y-3">
      <label htmlFor="upload-file" className="label">
        Add photos (JPEG, PNG, WebP) or PDF documents, up to 15 MB each
      </label>
      <input
        id="upload-file"
        ref={input}
        type="file"
        multiple
        accept="image/jpeg,image/png,image/webp,application/pdf"
        disabled={busy}
        onChange={(e) => send(e.target.files)}
        className="block w-full text-sm file:mr-3 file:rounded-md file:border-0 file:bg-tide file:px-4 file:py-2 file:text-white"
      />
      {busy && (
        <p role="status" className="text-sm text-ink-soft">
          Uploading…
        </p>
      )}
      {errors.length > 0 && (
        <div role="alert" className="rounded-md border border-brick bg-brick-pale px-3 py-2 text-sm text-brick">
          <ul className="space-y-1">
            {errors.map((e, i) => (
              <li key={i}>{e}</li>
            ))}
          </ul>
        </div>
      )}
      {items.length > 0 && (
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4" aria-label="Uploaded files">
          {items.map((u) => (
            <li key={u.id} className="card p-2 text-xs" data-upload={u.id}>
              {u.kind === 'photo' ? (
                <img src={u.url} alt={u.filename} className="h-24 w-full rounded object-cover" loading="lazy" />
              ) : (
                <div className="flex h-24 items-center justify-center rounded bg-paper-sunk">PDF</div>
              )}
              <a href={u.url} className="mt-1 block truncate underline" target="_blank" rel="noreferrer">
                {u.filename}
              </a>
              <span className="text-ink-muted">{(u.bytes / 1024).toFixed(0)} KB</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
