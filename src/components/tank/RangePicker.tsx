import { lazy, Suspense, useState } from 'react';
import { presetLabels, rangePresets, type RangeChoice } from '../../lib/views/range';
import { cn } from '../ui/cn';

// The form (react-hook-form and zod) loads when Custom is chosen, not with the page.
const CustomRangeForm = lazy(() => import('./CustomRangeForm'));

/** 6 h / 24 h / 7 d / 30 d, or a custom span entered as two local date-times. */
export function RangePicker({
  value,
  onChange,
  bounds,
}: {
  value: RangeChoice;
  onChange: (c: RangeChoice) => void;
  bounds: { from: number; to: number };
}) {
  const [custom, setCustom] = useState(value.preset === 'custom');
  return (
    <div className="flex flex-wrap items-end gap-3">
      <div
        role="radiogroup"
        aria-label="Time range"
        className="inline-flex overflow-hidden rounded-md border border-line-strong"
      >
        {rangePresets.map((p) => {
          const on = value.preset === p && !custom;
          return (
            <button
              key={p}
              type="button"
              role="radio"
              aria-checked={on}
              onClick={() => {
                setCustom(false);
                onChange({ preset: p });
              }}
              className={cn('px-3 py-1.5 text-sm', on ? 'bg-ink text-paper' : 'bg-paper-raised hover:bg-paper-sunk')}
            >
              {presetLabels[p]}
            </button>
          );
        })}
        <button
          type="button"
          role="radio"
          aria-checked={custom}
          onClick={() => setCustom(true)}
          className={cn('px-3 py-1.5 text-sm', custom ? 'bg-ink text-paper' : 'bg-paper-raised hover:bg-paper-sunk')}
        >
          Custom
        </button>
      </div>
      {custom && (
        <Suspense fallback={<span className="text-sm text-ink-muted">Loading…</span>}>
          <CustomRangeForm bounds={bounds} onShow={(r) => onChange({ preset: 'custom', ...r })} />
        </Suspense>
      )}
    </div>
  );
}
