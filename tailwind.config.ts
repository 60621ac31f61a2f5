import type { Config } from 'tailwindcss'

// Design tokens. Colours are CSS variables (see app/assets/css/main.css) so that the
// light and dark themes keep one hierarchy: paper, ink, slate chrome, one oxblood accent.
const token = (name: string) => `rgb(var(--qf-${name}) / <alpha-value>)`

export default <Partial<Config>>{
  darkMode: 'class',
  content: [
    './app/**/*.{vue,ts}',
    './content/**/*.md',
  ],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: token('paper'), raised: token('paper-raised'), sunk: token('paper-sunk') },
        ink: { DEFAULT: token('ink'), soft: token('ink-soft'), faint: token('ink-faint') },
        rule: token('rule'),
        accent: { DEFAULT: token('accent'), strong: token('accent-strong'), wash: token('accent-wash') },
        caution: { DEFAULT: token('caution'), wash: token('caution-wash') },
        settled: { DEFAULT: token('settled'), wash: token('settled-wash') },
      },
      fontFamily: {
        reading: ['Literata', 'Georgia', 'serif'],
        ui: ['"Source Sans 3"', 'system-ui', 'sans-serif'],
      },
      fontSize: {
        // A modular scale (ratio ≈ 1.2) for the interface and for reading.
        'fine': ['0.8125rem', { lineHeight: '1.25rem' }],
        'base': ['1rem', { lineHeight: '1.6rem' }],
        'lede': ['1.1875rem', { lineHeight: '1.85rem' }],
        'title-3': ['1.4375rem', { lineHeight: '1.9rem' }],
        'title-2': ['1.75rem', { lineHeight: '2.2rem' }],
        'title-1': ['2.125rem', { lineHeight: '2.6rem' }],
      },
      maxWidth: {
        measure: '70ch',
      },
      borderRadius: {
        plate: '3px',
      },
    },
  },
}
