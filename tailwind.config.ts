import type { Config } from 'tailwindcss';

// Osmia's own palette: a calm, clear-water look. `tide` carries actions and the brand, `basin` the
// cool neutrals, `kelp`, `sand` and `ember` say ok, caution and fault. The shades used for text
// on white (600 and darker) and for white text on a fill (700 and darker) pass WCAG AA (≥ 4.5:1);
// basin-400, the border of form fields, keeps the 3:1 that WCAG 1.4.11 asks of a control's edge.
const config = {
  theme: {
    extend: {
      colors: {
        tide: {
          50: '#eef7f9',
          100: '#d4ecf1',
          200: '#a9d8e3',
          300: '#74bccd',
          400: '#3f9bb2',
          500: '#237f97',
          600: '#1a677d',
          700: '#165467',
          800: '#144555',
          900: '#123a47',
          950: '#0a2530',
        },
        basin: {
          50: '#f5f8f9',
          100: '#e9eff1',
          200: '#d3dee2',
          300: '#b0c2c9',
          400: '#7a949e',
          500: '#62808b',
          600: '#4d6873',
          700: '#40555e',
          800: '#37474f',
          900: '#2e3b42',
          950: '#1b252a',
        },
        kelp: {
          50: '#f0f8f1',
          100: '#dbefdd',
          200: '#b7dfbd',
          500: '#3f8a4b',
          600: '#2f7139',
          700: '#285b31',
          800: '#234a2a',
        },
        sand: {
          50: '#fdf8ec',
          100: '#f9edcb',
          200: '#f2d98f',
          500: '#b7791f',
          600: '#97601a',
          700: '#784c17',
          800: '#5f3d16',
        },
        ember: {
          50: '#fdf3f2',
          100: '#fbe4e1',
          200: '#f6c7c1',
          500: '#c8473a',
          600: '#ab3629',
          700: '#8d2c22',
          800: '#742821',
        },
      },
      fontFamily: {
        sans: ['"Fira Sans"', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;

// Tailwind reads the config's default export.
export default config;
