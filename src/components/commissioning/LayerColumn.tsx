import { temperatureColour } from '../../lib/ui/temperature-scale';

/** A cylinder's layers as a column, top at the top, each coloured by its temperature. */
export function LayerColumn({ layersC, label }: { layersC: (number | null)[]; label: string }) {
  const top = [...layersC].map((c, i) => ({ c, i })).reverse();
  return (
    <figure aria-label={label} className="inline-flex flex-col items-stretch">
      <ol className="w-40 overflow-hidden rounded-[1.25rem] border-2 border-ink-soft">
        {top.map(({ c, i }) => (
          <li
            key={i}
            data-layer={i}
            className="flex h-7 items-center justify-between px-3 text-xs"
            style={{
              background: c === null ? '#9aa3a8' : temperatureColour(c),
              color: c !== null && c > 45 ? '#15232c' : '#ffffff',
            }}
          >
            <span>{i === layersC.length - 1 ? 'top' : i === 0 ? 'bottom' : `#${i + 1}`}</span>
            <span className="figure">{c === null ? 'no reading' : `${c.toFixed(1)} °C`}</span>
          </li>
        ))}
      </ol>
      <figcaption className="mt-1 text-xs text-ink-muted">{label}</figcaption>
    </figure>
  );
}
