import type { Config } from 'tailwindcss'

// Setline's tokens, our own palette: plaster neutrals carry the page, kiln is the one accent
// for action; sage, ochre and madder mark state, always beside a word or shape. Every text
// pair meets WCAG 2.2 AA contrast (4.5:1 text, 3:1 controls).
export default {
  content: ['./app/**/*.{vue,ts}'],
  theme: {
    extend: {
      colors: {
        plaster: { DEFAULT: '#FAF8F3', surface: '#EDE8DF', line: '#D6CFC2', ink: '#2F2B27', muted: '#5E574F' },
        kiln: { DEFAULT: '#A6452B', dark: '#863520', light: '#F3E2DC' },
        sage: { DEFAULT: '#4F6F4B', light: '#E3EBE1' },
        ochre: { DEFAULT: '#8A5E0F', light: '#F5EAD3' },
        madder: { DEFAULT: '#8B2635', light: '#F4DEE1' },
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible Next"', 'system-ui', 'sans-serif'],
      },
      minHeight: { touch: '48px', action: '64px' },
      minWidth: { touch: '48px' },
    },
  },
  plugins: [],
} satisfies Config
