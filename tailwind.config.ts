import type { Config } from 'tailwindcss';

// Loaded from src/styles/index.css with @config. Because the CSS imports Tailwind with source(none),
// this content list is the only place Tailwind looks for class names.
export default {
  content: ['index.html', 'src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Public Sans"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
      colors: {
        // Warm paper greys for surfaces: easy on the eyes under bench lamps.
        paper: {
          50: '#fbfaf8',
          100: '#f3f2ee',
          200: '#e6e3dc',
          300: '#d3cfc6',
        },
        // Text greys. 600 is the lightest used for text: 5.9:1 on paper-100, so WCAG AA holds everywhere.
        ink: {
          400: '#9aa1a8',
          600: '#555d66',
          800: '#3d444b',
          950: '#1c2024',
        },
        // The one accent, a deep verdigris. 600 on white is 6:1; white on 600 is the same.
        accent: {
          50: '#e9f4f1',
          100: '#cfe7e1',
          200: '#a6d3c9',
          600: '#1d6f63',
          700: '#17594f',
          800: '#124a42',
        },
        danger: {
          50: '#fdf0ee',
          200: '#f3c4bd',
          700: '#b42318',
        },
      },
      maxWidth: {
        page: '72rem',
      },
    },
  },
} satisfies Config;
