import type { FiguresQuality } from '../../lib/thermal';
import { qualityMark } from '../../lib/views/quality-words';
import { cn } from './cn';

type Quality = Pick<FiguresQuality, 'status' | 'leftOut' | 'reason'>;

/** A figure in a table: the value, marked when estimated; the short reason instead when withheld. */
export function QualifiedFigure({ value, q, testId }: { value: string; q: Quality; testId?: string }) {
  const mark = qualityMark(q);
  if (q.status === 'withheld')
    return (
      <span className="text-xs text-ochre" title={q.reason ?? undefined} data-quality="withheld" data-testid={testId}>
        {mark}
      </span>
    );
  return (
    <span data-quality={q.status} data-testid={testId} title={q.reason ?? undefined}>
      <span className="figure">{value}</span>
      {mark && <span className="ml-1 text-xs text-ochre">{mark}</span>}
    </span>
  );
}

/** The sentence saying why figures are estimated or withheld (nothing when measured). */
export function QualityNote({ q, className }: { q: Quality; className?: string }) {
  if (q.status === 'measured' || !q.reason) return null;
  return (
    <p
      className={cn(
        'rounded border px-3 py-2 text-sm',
        q.status === 'withheld' ? 'border-brick bg-brick-pale' : 'border-ochre bg-ochre-pale',
        className,
      )}
      data-testid="figures-quality"
      data-quality={q.status}
    >
      {q.reason}
    </p>
  );
}
