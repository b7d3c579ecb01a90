/** @type {import('tailwindcss').Config} */
// Loopfold's palette as theme tokens; pages use the names, never hex codes.
export default {
  content: ['./src/**/*.{astro,html,js,jsx,ts,tsx,md}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#17212b', soft: '#3b4754', faint: '#5d6873' },
        paper: { DEFAULT: '#f6f5f1', deep: '#ebe9e2', line: '#d9d6cc' },
        card: '#ffffff',
        kelp: { DEFAULT: '#1f6f64', hover: '#15524a', tint: '#e3efec' },
        ochre: { DEFAULT: '#c9831a', text: '#8f5c0e', tint: '#f7ebd6' },
        brick: { DEFAULT: '#a8321f', tint: '#f6e1dc' },
        moss: { DEFAULT: '#4b7a2a', tint: '#e6efdd' },
        harbour: { DEFAULT: '#3a5879', tint: '#e1e8f0' },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
      minHeight: { touch: '48px' },
      minWidth: { touch: '48px' },
    },
  },
  plugins: [],
};
