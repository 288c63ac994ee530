// The PDF's fonts (Atkinson Hyperlegible, WOFF 1 from @fontsource: pdfkit cannot read WOFF2),
// built into the server bundle by Nitro's raw plugin, so nothing is read from disk or fetched.
// Two subsets of each weight: latin, and latin-ext for names like Łucja or Dvořák (server/pdf/text.ts).
// Loaded with a dynamic import (server/utils/quote-pdf.ts) so they sit in a chunk of their own:
// Nitro marks raw chunks ROLLUP_NO_REPLACE, which in the main chunk stops its import.meta rewrite
// and breaks the serving of static files.
/* eslint-disable @typescript-eslint/ban-ts-comment */
// @ts-ignore no types for raw: imports
import regular from 'raw:@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-400-normal.woff'
// @ts-ignore no types for raw: imports
import bold from 'raw:@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-700-normal.woff'
// @ts-ignore no types for raw: imports
import regularExt from 'raw:@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-ext-400-normal.woff'
// @ts-ignore no types for raw: imports
import boldExt from 'raw:@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-ext-700-normal.woff'

export const regularWoff = regular as unknown as Uint8Array
export const boldWoff = bold as unknown as Uint8Array
export const regularExtWoff = regularExt as unknown as Uint8Array
export const boldExtWoff = boldExt as unknown as Uint8Array
