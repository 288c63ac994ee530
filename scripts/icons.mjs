// Draws Setwell's app icons (the trowel-stroke mark of public/favicon.svg) as PNGs for the web
// app manifest and the phone's home screen: `node scripts/icons.mjs`. The PNGs are committed; run
// this again only when the artwork changes. sharp is already a dependency (photos).
import { writeFile } from 'node:fs/promises'
import sharp from 'sharp'

const CLAY = '#9C5240'
const PALE = '#FBF3F0'
const strokes = `<path d="M7 21c4-1.5 6-1.5 9 0s5 1.5 9 0M7 15c4-1.5 6-1.5 9 0s5 1.5 9 0" stroke="${PALE}" stroke-width="2.6" fill="none" stroke-linecap="round"/>`
// rounded, as on the favicon; and "maskable": full-bleed, the mark inside the middle 80 % the phone may crop to
const rounded = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32"><rect width="32" height="32" rx="7" fill="${CLAY}"/>${strokes}</svg>`
const maskable = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32"><rect width="32" height="32" fill="${CLAY}"/><g transform="translate(3.2 3.2) scale(0.8)">${strokes}</g></svg>`

const out = [
  ['public/icons/icon-192.png', rounded, 192],
  ['public/icons/icon-512.png', rounded, 512],
  ['public/icons/maskable-512.png', maskable, 512],
  ['public/icons/apple-touch-180.png', maskable, 180],
]
for (const [file, svg, size] of out) {
  await writeFile(file, await sharp(Buffer.from(svg), { density: (72 * size) / 32 }).resize(size, size).png({ compressionLevel: 9 }).toBuffer())
  console.log(file)
}
