import type { Config } from 'tailwindcss'

// Bloomline's own palette: moss for the brand and actions, oat for paper, heather and ember as accents.
// Text pairs are chosen for WCAG 2.2 AA contrast (4.5:1 for body text) on oat-50 and white.
export default {
  content: ['./app/**/*.{vue,ts}', './shared/**/*.ts'],
  theme: {
    extend: {
      colors: {
        moss: {
          50: '#eef5f0', 100: '#d7e8dc', 200: '#b2d2bc', 300: '#84b596', 400: '#57936f',
          500: '#3a7654', 600: '#2d5f45', 700: '#24463a', 800: '#1b3a2f', 900: '#12271f',
        },
        oat: {
          50: '#fbf8f1', 100: '#f5efe2', 200: '#e9e0cc', 300: '#d8ccb2', 400: '#bba98a',
          500: '#9b8c6e', 600: '#7a6d53', 700: '#5e5340', 800: '#433b2d', 900: '#2c2619',
        },
        heather: { 100: '#f1e6f0', 300: '#c9a6c7', 500: '#8e5a8c', 700: '#643d63' },
        ember: { 100: '#fbe7dd', 300: '#eea98a', 500: '#c4562a', 700: '#8f3a19' },
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible Next Variable"', 'system-ui', 'sans-serif'],
        display: ['"Fraunces Variable"', 'Georgia', 'serif'],
      },
      minHeight: { touch: '44px' },
      minWidth: { touch: '44px' },
    },
  },
  plugins: [],
} satisfies Config
