import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

// The words people read (issue 17): every user-visible string in app/, server/ and shared/ is listed
// (a pragmatic scan, not a parser: the text and attribute values of .vue templates, and the string
// literals of their expressions, scripts and every .ts file, comments left out), and each word or
// phrase Setwell replaced fails here wherever it comes back. The replacements are in DEVELOPERS.md
// ("Words"). A line may carry a replaced phrase on purpose (the code that mends old stored words)
// when it says so with the marker `words-test: old words, mended`.

const ROOT = fileURLToPath(new URL('../..', import.meta.url))
const DIRS = ['app', 'server', 'shared']
const MARKER = 'words-test: old words, mended'

export interface Found { file: string, line: number, text: string, where: 'template' | 'code', holes: string[], tagged?: boolean }

function filesUnder(dir: string): string[] {
  const out: string[] = []
  for (const name of readdirSync(dir)) {
    const path = join(dir, name)
    if (statSync(path).isDirectory()) out.push(...filesUnder(path))
    else if (/\.(vue|ts)$/.test(name) && !name.endsWith('.d.ts')) out.push(path)
  }
  return out
}

/**
 * The string literals of JavaScript or TypeScript source, comments skipped: '...', "..." and
 * template literals (their ${} parts scanned in turn, their text kept with {} in place of each).
 * Regular expression literals are skipped where a `/` cannot be a division.
 */
export function stringLiterals(src: string): { text: string, at: number, holes: string[], tagged: boolean }[] {
  const out: { text: string, at: number, holes: string[], tagged: boolean }[] = []
  let i = 0
  let last = '' // the last significant character or word, to tell a regex from a division
  const regexAfter = (prev: string) => prev === '' || /[(,=:[!&|?{};+\-*%<>~^]$/.test(prev) || /^(return|typeof|case|in|of|void|delete|throw|new|do|else)$/.test(prev)

  function scan(stopAtBrace: boolean): void {
    let depth = 0
    while (i < src.length) {
      const c = src[i]!
      const next = src[i + 1]
      if (c === '/' && next === '/') {
        while (i < src.length && src[i] !== '\n') i++
        continue
      }
      if (c === '/' && next === '*') {
        const end = src.indexOf('*/', i + 2)
        i = end < 0 ? src.length : end + 2
        continue
      }
      if (c === '\'' || c === '"') {
        const start = i++
        let text = ''
        while (i < src.length && src[i] !== c && src[i] !== '\n') {
          if (src[i] === '\\') {
            text += src[i + 1] ?? ''
            i += 2
            continue
          }
          text += src[i++]
        }
        i++
        out.push({ text, at: start, holes: [], tagged: false })
        last = 'x'
        continue
      }
      if (c === '`') {
        // sql`...` and the like: a tag's text is for a machine
        // a tag, with or without a type argument: sql`...`, sql<number>`...`
        const tagged = /[\w$](<[\w$<>[\], |]*>)?$/.test(src.slice(0, i))
        const start = i++
        let text = ''
        const holes: string[] = []
        while (i < src.length && src[i] !== '`') {
          if (src[i] === '\\') {
            text += src[i + 1] ?? ''
            i += 2
            continue
          }
          if (src[i] === '$' && src[i + 1] === '{') {
            i += 2
            const from = i
            scan(true)
            holes.push(src.slice(from, i).trim())
            i++ // the closing brace
            text += '{}'
            continue
          }
          text += src[i++]
        }
        i++
        out.push({ text, at: start, holes, tagged })
        last = 'x'
        continue
      }
      if (c === '/' && regexAfter(last)) {
        i++
        let inClass = false
        while (i < src.length && src[i] !== '\n') {
          if (src[i] === '\\') {
            i += 2
            continue
          }
          if (src[i] === '[') inClass = true
          else if (src[i] === ']') inClass = false
          else if (src[i] === '/' && !inClass) break
          i++
        }
        i++
        last = 'x'
        continue
      }
      if (stopAtBrace) {
        if (c === '{') depth++
        if (c === '}') {
          if (depth === 0) return
          depth--
        }
      }
      if (/\s/.test(c)) {
        i++
        continue
      }
      if (/[\w$]/.test(c)) {
        let word = ''
        while (i < src.length && /[\w$]/.test(src[i]!)) word += src[i++]
        last = word
        continue
      }
      last = c
      i++
    }
  }
  scan(false)
  return out
}

const lineAt = (src: string, offset: number) => src.slice(0, offset).split('\n').length

/** Every string a person may read in one file, with where it is. */
export function visibleStrings(file: string, src: string): Found[] {
  const found: Found[] = []
  const add = (text: string, offset: number, where: Found['where'], holes: string[] = [], tagged = false) => {
    const line = lineAt(src, offset)
    if (src.split('\n')[line - 1]?.includes(MARKER)) return
    found.push({ file, line, text, where, holes, tagged })
  }
  const code = (part: string, base: number) => {
    for (const s of stringLiterals(part)) add(s.text, base + s.at, 'code', s.holes, s.tagged)
  }
  if (!file.endsWith('.vue')) {
    code(src, 0)
    return found
  }
  for (const m of src.matchAll(/<script[^>]*>([\s\S]*?)<\/script>/g)) code(m[1]!, m.index! + m[0].indexOf(m[1]!))
  const open = src.indexOf('<template')
  const close = src.lastIndexOf('</template>')
  if (open < 0 || close < 0) return found
  // comments blanked (kept the same length, so offsets still give the line)
  const template = src.slice(0, close).replace(/<!--[\s\S]*?-->/g, c => c.replace(/[^\n]/g, ' '))
  let at = template.indexOf('>', open) + 1
  while (at < template.length) {
    const lt = template.indexOf('<', at)
    const textEnd = lt < 0 ? template.length : lt
    const text = template.slice(at, textEnd)
    // text between tags: the words outside {{ }}, and the string literals inside them
    let last = 0
    for (const m of text.matchAll(/\{\{([\s\S]*?)\}\}/g)) {
      const words = text.slice(last, m.index)
      if (words.trim()) add(words.trim(), at + last, 'template')
      code(m[1]!, at + m.index! + 2)
      last = m.index! + m[0].length
    }
    if (text.slice(last).trim()) add(text.slice(last).trim(), at + last, 'template')
    if (lt < 0) break
    const gt = template.indexOf('>', lt)
    if (gt < 0) break
    // attribute values: a bound one is an expression, a plain one is text
    const tag = template.slice(lt, gt)
    for (const m of tag.matchAll(/([:@#]?[\w.:-]+)="([^"]*)"/g)) {
      const offset = lt + m.index! + m[0].indexOf('"') + 1
      if (/^[:@#]|^v-/.test(m[1]!)) code(m[2]!, offset)
      else add(m[2]!, offset, 'template')
    }
    at = gt + 1
  }
  return found
}

/** The <button>s whose whole text is one of these words. */
function buttonsSaying(src: string, words: RegExp): number[] {
  const lines: number[] = []
  for (const m of src.matchAll(/<button\b[^>]*>([^<]*)<\/button>/g)) {
    if (words.test(m[1]!.trim())) lines.push(lineAt(src, m.index!))
  }
  return lines
}

/** {{ x.issuedOn }}: a date field shown as it came, an ISO date, with no formatter round it. */
const BARE_DATE = /^(?!errors\b)[\w$.?!]*(On|At|Date|date|interestStart|firstDay|lastDay)$/

const files = DIRS.flatMap(d => filesUnder(join(ROOT, d))).sort()
const sources = new Map(files.map(f => [relative(ROOT, f), readFileSync(f, 'utf8')]))
const strings = [...sources].flatMap(([file, src]) => visibleStrings(file, src))

/** The replaced words and phrases (i17-shared.md, "Words"), each with what replaced it. */
const REPLACED: [RegExp, string][] = [
  [/\bbill to\b/i, '"Invoice to"'],
  [/local building regulations/i, '"the Building Regulations where they apply"'],
  [/licensed practice/i, '"good trade practice" (plastering is not a licensed trade)'],
  [/licensed surveyor/i, 'an accredited surveyor or laboratory tests asbestos; a licensed contractor removes licensable asbestos (HSE guidance)'],
  [/from memory \(unverified\)/i, '"a starting figure: set your own"'],
  [/demo price \(invented\)/i, '"a starting figure: set your own"'],
  [/undercoat, back to the background/i, '"Undercoat where the old plaster is off"'],
  [/price book/i, '"Rates and rules" (the API path and internal names stay)'],
  // the status written in, or put in from a value ("Status: {}" is a template literal's text)
  [/status: (issued|\{\})/i, 'no internal status on the customer\'s PDF'],
]

const show = (hits: Found[]) => hits.map(h => `${h.file}:${h.line}: ${JSON.stringify(h.text.length > 120 ? `${h.text.slice(0, 117)}...` : h.text)}`)

describe('the words people read', () => {
  it('finds the strings: templates, attributes and string literals, comments left out', () => {
    const sample = [
      '<script setup lang="ts">',
      '// a comment saying Price book',
      'const a = \'Save it\' // Bill to',
      'const re = /"not a string"/g',
      'const t = `Due ${shortDay(due)} at ${\'noon\'}`',
      '</script>',
      '<template>',
      '  <!-- Bill to, in a comment -->',
      '  <h1 title="A title">Heading {{ x ? \'yes it is\' : "no" }} tail</h1>',
      '  <Thing :label="`Label ${n}`" />',
      '</template>',
    ].join('\n')
    expect(visibleStrings('x.vue', sample).map(f => [f.line, f.text])).toEqual([
      [3, 'Save it'], [5, 'noon'], [5, 'Due {} at {}'],
      [9, 'A title'], [9, 'Heading'], [9, 'yes it is'], [9, 'no'], [9, 'tail'], [10, 'Label {}'],
    ])
    expect(strings.length).toBeGreaterThan(2000)
    expect(strings.some(s => s.file === 'app/utils/nav.ts' && s.text === 'Today')).toBe(true)
  })

  it.each(REPLACED)('no %s (replaced by %s)', (phrase) => {
    expect(show(strings.filter(s => phrase.test(s.text)))).toEqual([])
  })

  it('no button removing something says "Take off" (it says "Remove")', () => {
    const hits = [...sources].filter(([f]) => f.endsWith('.vue')).flatMap(([file, src]) => buttonsSaying(src, /^take off$/i).map(line => `${file}:${line}`))
    expect(hits).toEqual([])
  })

  it('no status code shown as it is ({{ v.status }}: "done", "cancelled"), only its words', () => {
    const hits: string[] = []
    for (const [file, src] of sources) {
      if (!file.endsWith('.vue')) continue
      const open = src.indexOf('<template')
      for (const m of src.slice(open).matchAll(/\{\{\s*([^}]*?)\s*\}\}/g)) {
        if (/^(?!errors\b)[\w$.?!]*\b(status|kind|role|portion)$/.test(m[1]!)) hits.push(`${file}:${lineAt(src, open + m.index!)}: {{ ${m[1]} }}`)
      }
    }
    expect(hits).toEqual([])
  })

  it('no ISO date in a page: none written in, and no date field shown bare ({{ x.dueOn }}, `due ${x.dueOn}`)', () => {
    const hits: string[] = []
    for (const [file, src] of sources) {
      for (const s of visibleStrings(file, src)) {
        if (s.where === 'template' && /\b\d{4}-\d{2}-\d{2}\b/.test(s.text)) hits.push(`${file}:${s.line}: ${s.text}`)
        // a template literal's words with a date field put in as it came (a URL or a key is no words)
        // (shared/utils/dates.ts is the formatters' own module: its messages are for developers)
        if (!s.tagged && file !== 'shared/utils/dates.ts' && /[a-z]{2,} \{\}/i.test(s.text) && s.holes.some(h => BARE_DATE.test(h))) hits.push(`${file}:${s.line}: \`${s.text}\` with ${s.holes.join(', ')}`)
      }
      if (!file.endsWith('.vue')) continue
      const open = src.indexOf('<template')
      for (const m of src.slice(open).matchAll(/\{\{\s*([^}]*?)\s*\}\}/g)) {
        if (BARE_DATE.test(m[1]!)) hits.push(`${file}:${lineAt(src, open + m.index!)}: {{ ${m[1]} }}`)
      }
    }
    expect(hits).toEqual([])
  })
})
