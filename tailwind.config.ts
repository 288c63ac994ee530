import type { Config } from 'tailwindcss'

// Setwell's palette, named after the trade (../shared/LOOK.md). Contrast notes in DEVELOPERS.md:
// white text sits on plaster-700 (5.7:1), dry-600 (4.9:1) and brick-600 (6.5:1); ochre is
// a background (ochre-100) with ochre-800 text.
export default {
  content: [],
  theme: {
    extend: {
      colors: {
        plaster: {
          50: '#FBF3F0', 100: '#F6E4DD', 200: '#EDC8BB', 300: '#E0A592', 400: '#CF826B',
          500: '#C27259', 600: '#B5654F', 700: '#9C5240', 800: '#7F4234', 900: '#63342A',
        },
        slate: {
          50: '#F4F6F8', 100: '#E6EAEE', 200: '#CBD3DA', 300: '#A9B5C0', 400: '#7D8C99',
          500: '#5B6B78', 600: '#45535F', 700: '#36424D', 800: '#2C3740', 900: '#26313B', 950: '#182027',
        },
        dry: { 50: '#F1F6F2', 100: '#DDEBE0', 200: '#BCD6C2', 600: '#4F7A5A', 700: '#3F6349', 800: '#324E3A' },
        ochre: { 50: '#FBF5EA', 100: '#F5E6C8', 200: '#EBCF96', 600: '#B9832B', 700: '#946820', 800: '#7A5417' },
        brick: { 50: '#FBEFED', 100: '#F5D9D5', 200: '#EBB4AC', 600: '#A23B2E', 700: '#84301F', 800: '#6A271A' },
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif'],
      },
      minHeight: { touch: '44px' },
      minWidth: { touch: '44px' },
    },
  },
} satisfies Config
