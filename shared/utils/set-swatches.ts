// Each set's look in the picture of a room: a fill from our own palette (tints of the colours in
// LOOK.md and a few of our own, each with a darker ink) AND a pattern, so two sets can be told
// apart in bright sun, on a black-and-white print and by colour-blind eyes. The number is always
// written too: colour and pattern are a help, never the only sign.

export type SwatchPattern = 'hatch' | 'dots' | 'cross' | 'rows' | 'columns' | 'backhatch' | 'grid' | 'zigzag'

export interface SetSwatch { name: string, fill: string, ink: string, pattern: SwatchPattern }

const COLOURS: { name: string, fill: string, ink: string }[] = [
  { name: 'Plaster pink', fill: '#F6E4DD', ink: '#9C5240' },
  { name: 'Sage', fill: '#DDEBE0', ink: '#3F6349' },
  { name: 'Ochre', fill: '#F5E6C8', ink: '#946820' },
  { name: 'Slate blue', fill: '#DCE4EE', ink: '#36424D' },
  { name: 'Brick', fill: '#F5D9D5', ink: '#84301F' },
  { name: 'Heather', fill: '#E9E1F1', ink: '#5B4A7A' },
  { name: 'Verdigris', fill: '#D5ECE9', ink: '#2E6A64' },
  { name: 'Sand', fill: '#EFE8D8', ink: '#6B5A3A' },
]
const PATTERNS: SwatchPattern[] = ['hatch', 'dots', 'cross', 'rows', 'columns', 'backhatch', 'grid', 'zigzag']

/** Set 1, 2, … : a colour and a pattern; after eight sets the colours move on by one so no two sets up to 64 look alike. */
export function setSwatch(set: number): SetSwatch {
  const i = Math.max(0, set - 1)
  const colour = COLOURS[(i + Math.floor(i / PATTERNS.length)) % COLOURS.length]!
  return { ...colour, pattern: PATTERNS[i % PATTERNS.length]! }
}

/** A surface not in any set (the plan has no skim for it). */
export const NO_SET: SetSwatch = { name: 'No set', fill: '#FFFFFF', ink: '#7D8C99', pattern: 'dots' }
