// Text in the PDF in any Latin script. The shipped font comes in two subsets (@fontsource's
// "latin" and "latin-ext" files), and a pdfkit font is one file, so a name like "Łucja Wójcik"
// would lose its Ł and ó in the latin file. This splits each string into runs by subset and draws
// the runs one after the other with pdfkit's `continued` text, switching to the matching
// latin-ext font for the runs that need it. Characters in neither subset are drawn as "?".

// the unicode-range of each subset, from @fontsource/atkinson-hyperlegible/index.css
const LATIN: [number, number][] = [[0x0000, 0x00FF], [0x0131, 0x0131], [0x0152, 0x0153], [0x02BB, 0x02BC], [0x02C6, 0x02C6], [0x02DA, 0x02DA], [0x02DC, 0x02DC], [0x0304, 0x0304], [0x0308, 0x0308], [0x0329, 0x0329], [0x2000, 0x206F], [0x20AC, 0x20AC], [0x2122, 0x2122], [0x2191, 0x2191], [0x2193, 0x2193], [0x2212, 0x2212], [0x2215, 0x2215], [0xFEFF, 0xFEFF], [0xFFFD, 0xFFFD]]
const LATIN_EXT: [number, number][] = [[0x0100, 0x02BA], [0x02BD, 0x02C5], [0x02C7, 0x02CC], [0x02CE, 0x02D7], [0x02DD, 0x02FF], [0x1D00, 0x1DBF], [0x1E00, 0x1E9F], [0x1EF2, 0x1EFF], [0x2020, 0x2020], [0x20A0, 0x20AB], [0x20AD, 0x20C0], [0x2113, 0x2113], [0x2C60, 0x2C7F], [0xA720, 0xA7FF]]

const within = (ranges: [number, number][], cp: number) => ranges.some(([a, b]) => cp >= a && cp <= b)

export interface TextRun { text: string, ext: boolean }

/** A string as runs of the latin subset and of the latin-ext subset (NFC first, so é is one character). */
export function scriptRuns(input: string): TextRun[] {
  const runs: TextRun[] = []
  for (const ch of input.normalize('NFC')) {
    const cp = ch.codePointAt(0)!
    const ext = !within(LATIN, cp) && within(LATIN_EXT, cp)
    const text = ext || within(LATIN, cp) ? ch : '?'
    const last = runs.at(-1)
    if (last && last.ext === ext) last.text += text
    else runs.push({ text, ext })
  }
  return runs
}

type Doc = PDFKit.PDFDocument

/**
 * Make `doc.text` draw latin-ext characters with the `${name}-ext` font registered beside each
 * font name used (e.g. 'regular' and 'regular-ext'). Everything else about `text` is unchanged.
 */
export function drawAnyLatin(doc: Doc): Doc {
  const text = doc.text.bind(doc) as (...args: unknown[]) => Doc
  const font = doc.font.bind(doc) as (...args: unknown[]) => Doc
  let current = 'regular'
  doc.font = ((...args: unknown[]) => {
    if (typeof args[0] === 'string') current = args[0]
    return font(...args)
  }) as Doc['font']
  doc.text = ((value: unknown, ...rest: unknown[]) => {
    const s = typeof value === 'string' ? value : String(value ?? '')
    const runs = scriptRuns(s)
    if (runs.length <= 1 && !runs[0]?.ext) return text(runs[0]?.text ?? s, ...rest)
    // text(str, x?, y?, options?) or text(str, options?)
    const optionsIndex = rest.findIndex(a => typeof a === 'object' && a !== null)
    const options = (optionsIndex >= 0 ? rest[optionsIndex] : {}) as Record<string, unknown>
    const place = optionsIndex >= 0 ? rest.slice(0, optionsIndex) : rest
    const base = current
    runs.forEach((run, i) => {
      const last = i === runs.length - 1
      font(run.ext ? `${base}-ext` : base)
      const opts = { ...options, continued: last ? Boolean(options.continued) : true }
      if (i === 0) text(run.text, ...place, opts)
      else text(run.text, opts)
    })
    font(base)
    return doc
  }) as Doc['text']
  return doc
}
