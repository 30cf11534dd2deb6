import type { Config } from 'tailwindcss';

/**
 * Shellwright's own palette: the browns of an old case in walnut and rosewood, the amber of fresh polish,
 * and parchment for the page.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        walnut: {
          50: '#f7f1ec',
          100: '#ebdcd0',
          200: '#d6b9a2',
          300: '#bb9172',
          400: '#8a5d43',
          500: '#7f5339',
          600: '#66412c',
          700: '#513323',
          800: '#3a2418',
          900: '#2a1a11',
          950: '#1a0f09',
        },
        amber: {
          50: '#fdf7ea',
          100: '#f9eac6',
          200: '#f2d28b',
          300: '#e9b651',
          400: '#d9932f',
          500: '#bf7720',
          600: '#9d5b19',
          700: '#7d4418',
          800: '#663818',
          900: '#552f17',
        },
        parchment: {
          50: '#fcf9f3',
          100: '#f7f0e2',
          200: '#eee1c6',
          300: '#e2cca2',
        },
        moss: { 100: '#e3eddc', 600: '#4f6b3a', 700: '#3f5630' },
        brick: { 100: '#f6e0d9', 600: '#a23b24', 700: '#85301d' },
      },
      fontFamily: {
        serif: ['Lora', 'Georgia', 'serif'],
        sans: ['"Segoe UI"', 'Roboto', '"Helvetica Neue"', 'Arial', '"DejaVu Sans"', 'sans-serif'],
      },
      boxShadow: {
        card: '0 1px 2px rgba(42, 26, 17, 0.06), 0 4px 14px rgba(42, 26, 17, 0.06)',
      },
    },
  },
} satisfies Config;
