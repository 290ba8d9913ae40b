import type { Config } from 'tailwindcss';

// Ferrisight palette: neutral slate ground, colour only for states that need attention.
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
        ink: { light: '#eef2f5', dark: '#12171c' },
        'attention-1': { DEFAULT: '#d9401f', soft: '#fbe3dc', deep: '#a82c12' },
        'attention-2': { DEFAULT: '#e0a11b', soft: '#fbefd2', deep: '#9c6b05' },
        'attention-3': { DEFAULT: '#8b7fd9', soft: '#ebe8fa', deep: '#5a4db3' },
        info: { DEFAULT: '#4fa3b5', deep: '#2c7384' },
        offline: '#8a9299',
      },
    },
  },
} satisfies Config;
