/** @type {import('tailwindcss').Config} */
// Heatlayer's design tokens. Components use these names only, never raw colour values.
export default {
  content: ['./src/**/*.{astro,html,js,jsx,ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#15232c', soft: '#3a4b55', muted: '#66767f' },
        paper: { DEFAULT: '#f5f3ee', raised: '#ffffff', sunk: '#ebe8e0' },
        line: { DEFAULT: '#d9d4c9', strong: '#b9b2a4' },
        kiln: { DEFAULT: '#b8512a', deep: '#8f3a1a', pale: '#f4e1d6' },
        tide: { DEFAULT: '#1d6f6c', deep: '#134f4d', pale: '#d7ecea' },
        ochre: { DEFAULT: '#a86d12', pale: '#f6e8cc' },
        brick: { DEFAULT: '#a8261d', pale: '#f7dcd8' },
        dusk: { DEFAULT: '#2e5a86', pale: '#dbe6f1' },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
      borderRadius: { card: '0.625rem' },
    },
  },
  plugins: [],
};
