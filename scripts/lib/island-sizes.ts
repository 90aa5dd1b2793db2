// The JavaScript each page sends to the browser, read from Astro's build output: the page's React
// islands (found through the server modules the page imports) and everything their client entries
// import statically, each file counted once per page, raw and gzipped. Used by `npm run bench:api`.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { gzipSync } from 'node:zlib';

export interface PageScripts {
  page: string;
  islands: string[];
  files: number;
  bytes: number;
  gzipBytes: number;
}

const staticImports = (code: string): string[] =>
  [...code.matchAll(/(?:import|export)\s*(?:[\w*{}\s,$]*?from\s*)?["']([^"']+\.m?js)["']/g)].map((m) => m[1]!);

/** Every file `entry` reaches through static imports (relative paths only: bare ones are server-only). */
function closure(entry: string, seen = new Set<string>()): Set<string> {
  if (seen.has(entry) || !existsSync(entry)) return seen;
  seen.add(entry);
  for (const spec of staticImports(readFileSync(entry, 'utf8'))) {
    if (spec.startsWith('.') || spec.startsWith('/')) closure(resolve(dirname(entry), spec), seen);
  }
  return seen;
}

function pageModules(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory()
      ? e.name === 'api'
        ? []
        : pageModules(join(dir, e.name))
      : e.name.endsWith('.astro.mjs')
        ? [join(dir, e.name)]
        : [],
  );
}

export function pageScriptSizes(dist: string): PageScripts[] {
  const server = join(dist, 'server');
  const manifestFile = readdirSync(server).find((f) => /^manifest_.*\.mjs$/.test(f));
  if (!manifestFile) throw new Error(`No Astro manifest in ${server}: build first.`);
  const manifest = readFileSync(join(server, manifestFile), 'utf8');
  const entries = JSON.parse(manifest.match(/"entryModules":(\{[^}]*\})/)![1]!) as Record<string, string>;
  const renderer = Object.entries(entries).find(([k]) => k.includes('@astrojs/react/client'))?.[1];

  return pageModules(join(server, 'pages'))
    .map((file) => {
      const components = new Set<string>();
      for (const mod of closure(file)) {
        for (const m of readFileSync(mod, 'utf8').matchAll(/"client:component-path":\s*"([^"]+)"/g))
          components.add(m[1]!);
      }
      const clientEntries = [...components].map((c) => entries[c]).filter((x): x is string => !!x);
      if (clientEntries.length && renderer) clientEntries.push(renderer);
      const files = new Set<string>();
      for (const e of clientEntries) for (const f of closure(join(dist, 'client', e))) files.add(f);
      let bytes = 0,
        gzipBytes = 0;
      for (const f of files) {
        const b = readFileSync(f);
        bytes += b.length;
        gzipBytes += gzipSync(b).length;
      }
      const page = `/${relative(join(server, 'pages'), file)
        .replace(/\.astro\.mjs$/, '')
        .replace(/(^|\/)index$/, '')
        .replace(/_([a-z]+)_/g, '[$1]')}`;
      return {
        page,
        islands: [...components].map((c) => c.split('/').pop()!).sort(),
        files: files.size,
        bytes,
        gzipBytes,
      };
    })
    .sort((a, b) => a.page.localeCompare(b.page));
}
