import type { Config } from 'tailwindcss';

// Scorecourt's own palette: ink for text, slate-blue ("court") for structure, one colour per model
// (champion violet, challenger copper) and three muted signal colours (good, caution, bad) that
// always come with a word or a symbol, never alone. `strong` shades are for text on the `soft`
// backgrounds; every text pairing used by the components is at least 4.5:1 (WCAG 2.2 AA).
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Work Sans"', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
      },
      colors: {
        ink: { DEFAULT: '#1d2430', soft: '#4a5567', faint: '#5f697a' },
        paper: { DEFAULT: '#f7f6f2', raised: '#ffffff', sunk: '#eeece6' },
        line: { DEFAULT: '#dedbd2', strong: '#b9b4a6' },
        court: {
          50: '#eef3f8',
          100: '#d8e3ee',
          200: '#b1c6dc',
          300: '#86a6c6',
          400: '#5c84ad',
          500: '#3f6892',
          600: '#2f5377',
          700: '#25415d',
          800: '#1c3147',
          900: '#142333',
        },
        champion: { DEFAULT: '#6b5b95', soft: '#e7e2f1', strong: '#4f4172' },
        challenger: { DEFAULT: '#c26a2e', soft: '#f6e4d6', strong: '#8a4515' },
        good: { DEFAULT: '#2d7a66', soft: '#dcefe8', strong: '#1f5d4d' },
        caution: { DEFAULT: '#a6731c', soft: '#f5ead2', strong: '#7a5210' },
        bad: { DEFAULT: '#a33a3a', soft: '#f4dcdc', strong: '#842c2c' },
      },
    },
  },
} satisfies Config;
