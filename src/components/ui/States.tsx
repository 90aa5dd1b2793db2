import type { ReactNode } from 'react';
import { ApiError } from '../../lib/query/client';
import { fmtClock } from '../../lib/views/format';
import { cn } from './cn';
import { useOnline } from './useOnline';

/** Placeholder while the first answer is on its way. */
export function Loading({ label, className }: { label: string; className?: string }) {
  return (
    <div
      role="status"
      aria-live="polite"
      className={cn(
        'flex items-center gap-3 rounded-card border border-dashed border-line-strong bg-paper-sunk/60 p-4 text-sm text-ink-soft',
        className,
      )}
    >
      <span aria-hidden="true" className="h-3 w-3 animate-pulse rounded-full bg-tide" />
      {label}
    </div>
  );
}

export function ErrorNotice({ error, onRetry, what }: { error: unknown; onRetry?: () => void; what: string }) {
  const message = error instanceof ApiError ? error.message : 'The server could not be reached.';
  return (
    <div
      role="alert"
      className="flex flex-wrap items-center gap-3 rounded-card border border-brick bg-brick-pale p-4 text-sm text-ink"
    >
      <span>
        <strong className="font-semibold">Could not load {what}.</strong> {message}
      </span>
      {onRetry && (
        <button type="button" className="btn-quiet ml-auto" onClick={onRetry}>
          Try again
        </button>
      )}
    </div>
  );
}

export function Empty({ children }: { children: ReactNode }) {
  return (
    <div className="rounded-card border border-dashed border-line-strong p-6 text-center text-sm text-ink-soft">
      {children}
    </div>
  );
}

/** Shown at the top of an island while the browser is offline; data stays on screen, marked as of its time. */
export function OfflineBanner({ updatedAt }: { updatedAt?: number }) {
  const online = useOnline();
  if (online) return null;
  return (
    <div role="status" className="mb-4 rounded-card border border-ochre bg-ochre-pale p-3 text-sm text-ink">
      <strong className="font-semibold">You are offline.</strong>{' '}
      {updatedAt ? `Figures shown are from ${fmtClock(updatedAt)}; they` : 'Figures'} will update when the connection
      returns.
    </div>
  );
}

/** "Updated 12:04 · live" with a spinner while refetching. */
export function Freshness({ updatedAt, fetching }: { updatedAt: number; fetching: boolean }) {
  return (
    <span className="text-xs text-ink-muted" aria-live="off">
      <span
        aria-hidden="true"
        className={cn('mr-1 inline-block h-2 w-2 rounded-full', fetching ? 'animate-pulse bg-tide' : 'bg-line-strong')}
      />
      Updated {fmtClock(updatedAt)} · refreshes every 10 s
    </span>
  );
}

/** A safety caution beside the step it concerns. */
export function Caution({ title, children }: { title: string; children: ReactNode }) {
  return (
    <aside className="rounded-card border border-ochre bg-ochre-pale p-3 text-sm text-ink" role="note">
      <strong className="font-semibold">{title}</strong> {children}
    </aside>
  );
}

/** A refusal, with its problems listed. */
export function Problem({ message, fields }: { message: string; fields?: { field: string; message: string }[] }) {
  return (
    <div role="alert" className="rounded-md border border-brick bg-brick-pale px-3 py-2 text-sm text-brick">
      <p>{message}</p>
      {fields && fields.length > 0 && (
        <ul className="mt-1 list-disc pl-5">
          {fields.map((f, i) => (
            <li key={i}>{f.message}</li>
          ))}
        </ul>
      )}
    </div>
  );
}
