import type { Config } from 'tailwindcss';

// Twistlog's own theme: high contrast for sunlight, large touch targets for gloves.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: '#0d1b1e',
        paper: '#f4f1e8',
        slate: { DEFAULT: '#10333d', light: '#1f5566' },
        signal: { DEFAULT: '#f2a13a', dark: '#8a4b00' },
        alert: { DEFAULT: '#b3261e', light: '#fde8e6' },
        good: { DEFAULT: '#1e6b3a', light: '#e3f3e8' },
        rule: '#c9c3b3',
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif'],
      },
      minHeight: { touch: '48px' },
      minWidth: { touch: '48px' },
    },
  },
} satisfies Config;
