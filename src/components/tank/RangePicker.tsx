import { useState } from 'react';
import { parseCustomRange, presetLabels, rangePresets, type RangeChoice } from '../../lib/views/range';
import { cn } from '../ui/cn';

const toLocalInput = (ms: number) => {
  const d = new Date(ms - new Date(ms).getTimezoneOffset() * 60_000);
  return d.toISOString().slice(0, 16);
};

/** 6 h / 24 h / 7 d / 30 d, or a custom span entered as two local date-times. */
export function RangePicker({ value, onChange, bounds }: { value: RangeChoice; onChange: (c: RangeChoice) => void; bounds: { from: number; to: number } }) {
  const [custom, setCustom] = useState(value.preset === 'custom');
  const [from, setFrom] = useState(toLocalInput(bounds.from));
  const [to, setTo] = useState(toLocalInput(bounds.to));
  const [error, setError] = useState<{ field: string; message: string } | null>(null);
  return (
    <div className="flex flex-wrap items-end gap-3">
      <div role="radiogroup" aria-label="Time range" className="inline-flex overflow-hidden rounded-md border border-line-strong">
        {rangePresets.map((p) => {
          const on = value.preset === p && !custom;
          return (
            <button key={p} type="button" role="radio" aria-checked={on} onClick={() => { setCustom(false); setError(null); onChange({ preset: p }); }}
              className={cn('px-3 py-1.5 text-sm', on ? 'bg-ink text-paper' : 'bg-paper-raised hover:bg-paper-sunk')}>{presetLabels[p]}</button>
          );
        })}
        <button type="button" role="radio" aria-checked={custom} onClick={() => { setCustom(true); setFrom(toLocalInput(bounds.from)); setTo(toLocalInput(bounds.to)); }}
          className={cn('px-3 py-1.5 text-sm', custom ? 'bg-ink text-paper' : 'bg-paper-raised hover:bg-paper-sunk')}>Custom</button>
      </div>
      {custom && (
        <form className="flex flex-wrap items-end gap-2" onSubmit={(e) => {
          e.preventDefault();
          const r = parseCustomRange(from, to);
          if ('field' in r) { setError(r); return; }
          setError(null);
          onChange({ preset: 'custom', ...r });
        }}>
          <div><label className="label" htmlFor="range-from">From</label><input id="range-from" type="datetime-local" className="field py-1" value={from} onChange={(e) => setFrom(e.target.value)} aria-invalid={error?.field === 'from'} aria-describedby={error ? 'range-error' : undefined} /></div>
          <div><label className="label" htmlFor="range-to">To</label><input id="range-to" type="datetime-local" className="field py-1" value={to} onChange={(e) => setTo(e.target.value)} aria-invalid={error?.field === 'to'} aria-describedby={error ? 'range-error' : undefined} /></div>
          <button type="submit" className="btn-primary py-1.5">Show</button>
          {error && <p id="range-error" role="alert" className="w-full text-sm text-brick">{error.message}</p>}
        </form>
      )}
    </div>
  );
}
