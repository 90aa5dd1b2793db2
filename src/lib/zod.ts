// The one way Heatlayer imports zod (Biome refuses `from 'zod'` elsewhere). In the browser zod
// must not compile its parsers with `new Function`: the Content-Security-Policy refuses eval, so
// schemas there run interpreted. The server keeps the compiled parsers for large telemetry batches.
import { z } from 'zod';

if (typeof window !== 'undefined') z.config({ jitless: true });

export { z };
export { ZodError } from 'zod';
