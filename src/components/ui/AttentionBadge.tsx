import { attentionLabels, type AttentionKind } from '../../lib/views/attention';
import { cn } from './cn';

const tone: Record<AttentionKind, string> = {
  offline: 'bg-ink text-paper',
  sensor_fault: 'bg-dusk-pale text-dusk border border-dusk',
  legionella_risk: 'bg-brick-pale text-brick border border-brick',
  short_cycling: 'bg-ochre-pale text-ink border border-ochre',
  low_hot_water: 'bg-tide-pale text-tide-deep border border-tide',
  immersion_heavy: 'bg-kiln-pale text-kiln-deep border border-kiln',
  heat_loss: 'bg-paper-sunk text-kiln-deep border border-dashed border-kiln',
};

export function AttentionBadge({ kind }: { kind: AttentionKind }) {
  return (
    <span
      className={cn('inline-flex items-center whitespace-nowrap rounded px-1.5 py-0.5 text-xs font-medium', tone[kind])}
    >
      {attentionLabels[kind]}
    </span>
  );
}
