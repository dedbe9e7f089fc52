import type { Config } from 'tailwindcss';

/**
 * Skewbench's design tokens. The palette takes its names from the bench itself:
 * `ink` (lab-notebook text), `ptfe` (the white dielectric, for surfaces), `copper` (centre conductors,
 * the accent), `phase` (a cool teal for links and focus), and states `pass`, `caution`, `fault`.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { 50: '#f3f5f8', 100: '#e2e7ee', 200: '#c5cedb', 300: '#9aa8bc', 400: '#6d7e97', 500: '#4f607a', 600: '#3c4b63', 700: '#2e3a4e', 800: '#212a3a', 900: '#151b26' },
        ptfe: { 50: '#fdfcf9', 100: '#f8f6f0', 200: '#efebe0', 300: '#e2dccb' },
        copper: { 50: '#fbf3ec', 100: '#f5e1cf', 200: '#ebc29f', 300: '#dd9c6a', 400: '#cd7b43', 500: '#b8622c', 600: '#9a4e22', 700: '#7a3d1c', 800: '#5b2e17', 900: '#3e2011' },
        phase: { 50: '#ecf7f6', 100: '#cdebe8', 300: '#7cc3bc', 500: '#2c8c84', 600: '#21726b', 700: '#1b5b56', 800: '#164845' },
        pass: { 50: '#eef7ee', 500: '#3b8a45', 700: '#2a6532' },
        caution: { 50: '#fdf6e3', 300: '#f0cc6e', 500: '#c9961a', 700: '#8a6410' },
        fault: { 50: '#fcefed', 300: '#eba39a', 500: '#c2412f', 700: '#8e2c20' },
      },
      fontFamily: {
        sans: ['"Nunito Sans"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
      },
      fontSize: {
        caption: ['0.75rem', { lineHeight: '1rem' }],
        body: ['0.9375rem', { lineHeight: '1.45rem' }],
        lead: ['1.0625rem', { lineHeight: '1.6rem' }],
        title: ['1.375rem', { lineHeight: '1.8rem', fontWeight: '700' }],
        display: ['1.875rem', { lineHeight: '2.25rem', fontWeight: '800' }],
      },
      borderRadius: {
        chip: '0.3rem',
        panel: '0.65rem',
      },
      boxShadow: {
        panel: '0 1px 0 rgba(21, 27, 38, 0.04), 0 2px 10px -4px rgba(21, 27, 38, 0.14)',
        lifted: '0 8px 28px -10px rgba(21, 27, 38, 0.35)',
        focus: '0 0 0 3px rgba(44, 140, 132, 0.35)',
      },
    },
  },
} satisfies Config;
