import { readdirSync, readFileSync } from 'node:fs'
import { join, relative, sep } from 'node:path'
import { describe, expect, it } from 'vitest'
import { brokenTextAt, DATE_RANGE, hasBrokenCharacter, isoDate, isoDateTime, queryWholeNumber, text, UNUSUAL_CHARACTER } from '../../shared/schemas/common'

// One text schema and one date schema for every route (issue 13, item 8): PostgreSQL's text refuses
// NUL, jsonb refuses half a surrogate pair, and the date code broke on the years 0000 and 9999.
// Our rules: C0 control characters but tab, line feed and carriage return are refused too; dates
// are real calendar dates (Gregorian: 29 February in years divisible by 4, not by 100 unless by
// 400) from 1900 to 2100.

const root = process.cwd()
function walk(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(e => e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)])
}

/**
 * Raw strings and dates are allowed in shared/schemas/common.ts only, and in these lines: the
 * secrets of links, matched whole by a strict pattern (a NUL or anything else fails it: 404).
 */
const ALLOWED = [
  ['shared/schemas/links.ts', 'key: z.string().regex(/^(?:[\\w-]{22})?[0-9a-f]{32}$/'],
  ['shared/schemas/links.ts', 'token: z.string().regex(/^[\\w-]{40,70}$/'],
  ['shared/schemas/links.ts', 'token: z.string().regex(/^[\\w-]{40,70}\\.ics$/'],
]
const RAW = /\bz\s*\.\s*(string|iso\s*\.\s*\w+|coerce\s*\.\s*\w+|date|stringFormat|templateLiteral)\s*\(/

describe('every schema builds its text and dates from shared/schemas/common.ts', () => {
  it('has no raw z.string(), z.iso.*, z.coerce.* or z.date() in shared/ or server/ outside common.ts, but the allowed token patterns', () => {
    const files = [...walk(join(root, 'shared')), ...walk(join(root, 'server'))].filter(f => /\.[cm]?[jt]s$/.test(f))
    expect(files.length).toBeGreaterThan(50)
    const found: string[] = []
    for (const abs of files) {
      const file = relative(root, abs).split(sep).join('/')
      if (file === 'shared/schemas/common.ts') continue
      readFileSync(abs, 'utf8').split('\n').forEach((line, i) => {
        if (!RAW.test(line)) return
        if (ALLOWED.some(([f, text]) => f === file && line.includes(text!))) return
        found.push(`${file}:${i + 1}: ${line.trim()}`)
      })
    }
    expect(found).toEqual([])
  })

  it('finds a raw one when there is one (the pattern is not blind)', () => {
    for (const line of ['x: z.string().max(4)', 'd: z.iso.date()', 'w: z.iso.datetime({ offset: true })', 'n: z.coerce.number()', 'z.date()', 'z . string ()']) expect(RAW.test(line), line).toBe(true)
    for (const line of ['text().max(4)', 'z.uuid()', 'z.int()', 'isoDate()', '// z.strings']) expect(RAW.test(line), line).toBe(false)
  })

  it('allows only lines that are there (a stale allowance is removed)', () => {
    for (const [file, line] of ALLOWED) expect(readFileSync(join(root, file!), 'utf8'), file).toContain(line)
  })
})

describe('text(): no NUL, no other C0 control but tab and line breaks, no lone surrogate (PostgreSQL text, jsonb; our rule for C0)', () => {
  const t = text().trim().max(50)
  it.each([
    ['a name', 'Wren Ashdown', true],
    ['accents and an emoji (a whole surrogate pair)', 'Zoë Ćosić 👷', true],
    ['tab, line feed and carriage return', 'Line one\r\n\tLine two', true],
    ['NUL', 'Wren\u0000', false],
    ['NUL alone', '\u0000', false],
    ['a lone high surrogate', 'Wren\uD800', false],
    ['a lone low surrogate', '\uDC00Wren', false],
    ['two high surrogates', '\uD83D\uD83D', false],
    ['a pair the wrong way round', '\uDC77\uD83D', false],
    ['bell (C0)', 'Wren\u0007', false],
    ['escape (C0)', '\u001B[31mred', false],
    ['vertical tab inside', 'a\u000Bb', false],
  ])('%s -> accepted %s', (_what, value, ok) => {
    const r = t.safeParse(value)
    expect(r.success).toBe(ok)
    if (!ok) expect(r.error!.issues[0]!.message).toBe(UNUSUAL_CHARACTER)
  })

  it.each([
    ['', false], ['plain', false], ['\u0000', true], ['a\uD800', true], ['\uDFFFa', true], ['👷', false], ['a\u0007', false],
  ])('hasBrokenCharacter(%j) -> %s (what the body and query readers refuse anywhere)', (s, broken) => expect(hasBrokenCharacter(s)).toBe(broken))
})

describe('isoDate(): a real calendar date from 1900-01-01 to 2100-12-31 (Gregorian calendar; our range)', () => {
  it.each([
    ['1900-01-01', true], ['2100-12-31', true], ['2026-12-04', true],
    ['1899-12-31', false], ['2101-01-01', false], ['0000-01-01', false], ['9999-12-31', false],
    ['2028-02-29', true], ['2027-02-29', false], ['2000-02-29', true], ['2100-02-29', false], ['2026-04-31', false], ['2026-13-01', false],
    ['04/12/2026', false], ['2026-12-04T10:00:00Z', false],
  ])('%s -> accepted %s', (value, ok) => expect(isoDate().safeParse(value).success).toBe(ok))

  it('names the range when the date is out of it, and the format when it is no date', () => {
    expect(isoDate().safeParse('0000-01-01').error!.issues[0]!.message).toBe(DATE_RANGE)
    expect(isoDate('Pick the day.').safeParse('tomorrow').error!.issues[0]!.message).toBe('Pick the day.')
  })
})

describe('isoDateTime(): a date and time with an offset whose moment is in 1900 to 2100 (our range)', () => {
  it.each([
    ['2026-12-04T09:00:00.000Z', true], ['2026-12-04T09:00:00+01:00', true], ['1900-01-01T00:00:00Z', true], ['2100-12-31T23:59:59Z', true],
    ['2100-12-31T23:00:00-05:00', false], // 2101-01-01T04:00Z
    ['0000-01-01T09:00:00.000Z', false], ['9999-12-31T09:00:00.000Z', false], ['1899-12-31T23:59:59Z', false],
    ['2026-02-30T09:00:00Z', false], ['2026-12-04', false],
  ])('%s -> accepted %s', (value, ok) => expect(isoDateTime().safeParse(value).success).toBe(ok))
})

describe('queryWholeNumber(): a whole number in a query string, within its bounds (our rule)', () => {
  const page = queryWholeNumber('A page', 1, 10_000, 1)
  it.each([
    ['1', 1], ['10000', 10_000], [undefined, 1],
  ])('%s -> %s', (value, n) => expect(page.parse(value)).toBe(n))
  it.each(['0', '10001', '1.5', '9007199254740992', '1e308', '-1e308', 'two', 'Infinity'])('refuses %s, naming the bounds', (value) => {
    const r = page.safeParse(value)
    expect(r.success).toBe(false)
    expect(r.error!.issues[0]!.message).toBe('A page is a whole number from 1 to 10000.')
  })
})

describe('brokenTextAt(): where the body and query readers find a NUL or a lone surrogate (PostgreSQL text, jsonb)', () => {
  it.each<[string, unknown, (string | number)[] | null]>([
    ['a clean body', { name: 'Wren', rows: [{ notes: 'a\nb' }], n: 5, ok: true, none: null }, null],
    ['a top-level field', { name: 'Wren\u0000' }, ['name']],
    ['inside an array of objects (an import\'s rows)', { rows: [{ name: 'A' }, { name: 'B\uD800' }] }, ['rows', 1, 'name']],
    ['in a key (a record\'s key)', { moves: { 'a\u0000': 1 } }, ['moves', 'a\u0000']],
    ['a string on its own', '\uDC00', []],
    ['the first of two, in order', { a: 'x\u0000', b: 'y\u0000' }, ['a']],
    ['a whole emoji is fine', { name: '👷' }, null],
  ])('%s', (_what, value, path) => expect(brokenTextAt(value)).toEqual(path))

  it('walks a body nested 100,000 deep without running out of stack', () => {
    let deep: unknown = 'end\u0000'
    for (let i = 0; i < 100_000; i++) deep = [deep]
    expect(brokenTextAt(deep)).toHaveLength(100_000)
  })
})
