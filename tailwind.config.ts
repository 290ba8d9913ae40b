import type { Config } from 'tailwindcss';

// Ferrisight palette: neutral slate ground, colour only for states that need attention.
// Theme-dependent tokens point at CSS variables set per theme in web/src/index.css
// (wall = dark, desk = light), so components never need dark: variants.
// Contrast (WCAG 2.x) checked in both themes: text tokens ≥ 4.5:1 on panel and canvas,
// borders and markers ≥ 3:1 on panel.
const attention = (n: 1 | 2 | 3) => ({
  DEFAULT: `var(--fs-a${n})`, // borders and markers
  ink: `var(--fs-a${n}-ink)`, // text on panel or soft
  soft: `var(--fs-a${n}-soft)`, // tinted background
  fill: `var(--fs-a${n}-fill)`, // solid pill background
  on: `var(--fs-a${n}-on)`, // text on fill
});

export default {
  content: ['./index.html', './web/src/**/*.{ts,tsx}'],
  darkMode: ['class', '[data-theme="wall"]'],
  theme: {
    extend: {
      fontFamily: { sans: ['Barlow', 'system-ui', 'sans-serif'] },
      colors: {
        ground: {
          50: '#f4f6f8', 100: '#e6eaee', 200: '#cdd4db', 300: '#aab4be', 400: '#7d8995',
          500: '#5b6672', 600: '#444e59', 700: '#323a43', 800: '#232a31', 900: '#171c21', 950: '#0f1317',
        },
        canvas: 'var(--fs-canvas)',
        panel: { DEFAULT: 'var(--fs-panel)', 2: 'var(--fs-panel-2)' },
        line: { DEFAULT: 'var(--fs-line)', strong: 'var(--fs-line-strong)' },
        ink: { DEFAULT: 'var(--fs-ink)', muted: 'var(--fs-ink-muted)', light: '#eef2f5', dark: '#12171c' },
        'attention-1': attention(1),
        'attention-2': attention(2),
        'attention-3': attention(3),
        info: { DEFAULT: 'var(--fs-info)', ink: 'var(--fs-info-ink)' },
        offline: { DEFAULT: 'var(--fs-offline)', ink: 'var(--fs-offline-ink)' },
      },
    },
  },
} satisfies Config;
