import { describe, expect, it } from 'vitest'
import { scriptRuns } from '../../server/pdf/text'

// Which subset of the shipped font draws each character: the unicode ranges are @fontsource's
// (node_modules/@fontsource/atkinson-hyperlegible/index.css), the font files the PDF embeds.
describe('scriptRuns', () => {
  it.each([
    ['Ffion Maddox', [{ text: 'Ffion Maddox', ext: false }]],
    ['£151.20 – Café', [{ text: '£151.20 – Café', ext: false }]],
    ['Łucja', [{ text: 'Ł', ext: true }, { text: 'ucja', ext: false }]],
    ['Dvořák', [{ text: 'Dvo', ext: false }, { text: 'ř', ext: true }, { text: 'ák', ext: false }]],
    // a decomposed é (e + combining acute) is composed first, so it stays in the latin run
    ['Cafe\u0301', [{ text: 'Café', ext: false }]],
    // outside both subsets: drawn as ?
    ['Tile 🧱', [{ text: 'Tile ?', ext: false }]],
    ['', []],
  ])('%s', (input, runs) => {
    expect(scriptRuns(input)).toEqual(runs)
  })
})
