// Design tokens for canvas drawing (uPlot cannot read Tailwind classes): the same values as
// tailwind.config.mjs, read from it so there is one source.
import config from '../../../tailwind.config.mjs';

type Shade = { DEFAULT: string } & Record<string, string>;
const c = config.theme!.extend!.colors as unknown as Record<
  'ink' | 'paper' | 'line' | 'kiln' | 'tide' | 'ochre' | 'brick' | 'dusk',
  Shade
>;
export const tokens = c;
export const fontMono = '12px "IBM Plex Mono", ui-monospace, monospace';
