import type { Config } from 'tailwindcss';

// The product's one theme: warm paper, dark ink, indigo for actions, amber for cautions and pooled results,
// muted red for refusals and errors.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: '#f7f3ea', deep: '#efe8d8', edge: '#d9cfb9' },
        ink: { DEFAULT: '#1f1b16', soft: '#4a443b', faint: '#7a7264' },
        action: { DEFAULT: '#3f3fa8', dark: '#2e2e80', light: '#e4e4f6' },
        caution: { DEFAULT: '#b7791f', light: '#fbf0d9', dark: '#7c5212' },
        refusal: { DEFAULT: '#a2453d', light: '#f6e3e0' },
      },
      fontFamily: {
        reading: ['Merriweather', 'Georgia', 'serif'],
        ui: ['system-ui', '-apple-system', 'Segoe UI', 'Roboto', 'sans-serif'],
      },
    },
  },
} satisfies Config;
