// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwind from '@astrojs/tailwind';
import { pageCspDirectives } from './src/lib/server/security-headers.ts';

// Hostnames the server answers for. Astro 5.14+ treats every request as coming to
// http://localhost/ unless the host is listed here, which breaks the origin check on form posts
// and the links written into e-mails. Extra names come from ALLOWED_HOSTS at build time.
const extraHosts = (process.env.ALLOWED_HOSTS ?? '')
  .split(',')
  .map((h) => h.trim())
  .filter(Boolean);

export default defineConfig({
  output: 'server',
  // Parallel test runs on other port blocks build into their own folder (scripts/lib/build.ts).
  outDir: process.env.HEATLAYER_BUILD_DIR || './dist',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), tailwind({ applyBaseStyles: false })],
  security: {
    checkOrigin: true,
    allowedDomains: [
      { hostname: 'localhost' },
      { hostname: '127.0.0.1' },
      ...extraHosts.map((hostname) => ({ hostname })),
    ],
  },
  // Pages send a Content-Security-Policy header: inline scripts and styles only by Astro's hashes
  // (src/lib/server/security-headers.ts has the rest of the policy and the other answers' headers).
  experimental: { csp: { directives: pageCspDirectives } },
  server: { host: '127.0.0.1' },
  vite: {
    ssr: { external: ['@node-rs/argon2', 'pg-native'] },
  },
});
