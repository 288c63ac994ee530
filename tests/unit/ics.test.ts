import { describe, expect, it } from 'vitest'
import { foldIcsLine, refoldIcs } from '../../shared/utils/ics'

// Source: RFC 5545 (iCalendar), 3.1 "Content Lines": lines are delimited by CRLF and SHOULD NOT
// be longer than 75 octets, excluding the line break; a long line is split with CRLF followed by
// a single space (or tab), and unfolding removes that CRLF and the whitespace character after it.

const octets = (s: string) => new TextEncoder().encode(s).length
const unfold = (s: string) => s.replace(/\r\n[ \t]/g, '')

describe('foldIcsLine', () => {
  it.each<[string, string]>([
    ['a short line stays as it is', 'SUMMARY:J-0001 Noor Halloran'],
    ['exactly 75 octets stays on one line', `DESCRIPTION:${'a'.repeat(63)}`],
    ['76 octets folds once', `DESCRIPTION:${'a'.repeat(64)}`],
    ['a long ASCII line', `DESCRIPTION:${'Skim the back bedroom and the landing. '.repeat(6)}`],
    // 2 octets a character in UTF-8: the `ics` package's 75 characters would be up to 150 octets
    ['accents (2 octets each)', `DESCRIPTION:${'Zoë Brontë à la façade '.repeat(8)}`],
    // 3 octets each
    ['dashes and a pound sign', `LOCATION:${'— £ ‘ ’ … '.repeat(12)}`],
    // 4 octets each: never split inside the character
    ['emoji (4 octets each)', `DESCRIPTION:${'🧱'.repeat(40)}`],
  ])('%s: every line at most 75 octets, unfolds to the same text', (_what, line) => {
    const folded = foldIcsLine(line)
    const lines = folded.split('\r\n')
    for (const l of lines) expect(octets(l)).toBeLessThanOrEqual(75)
    lines.slice(1).forEach(l => expect(l.startsWith(' ')).toBe(true))
    expect(unfold(folded)).toBe(line)
    if (octets(line) <= 75) expect(lines).toHaveLength(1)
    else expect(lines.length).toBeGreaterThan(1)
    // no lone surrogate: every piece is whole characters
    for (const l of lines) expect(l).not.toMatch(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/)
  })
})

describe('refoldIcs', () => {
  it('unfolds what the ics package folded by characters and refolds by octets, ending each line in CRLF', () => {
    const long = `DESCRIPTION:${'Zoë ‘Brontë’ — façade '.repeat(6)}`
    // the package's way: 75 characters, then CRLF and a tab
    const byChars = `BEGIN:VCALENDAR\r\n${long.slice(0, 75)}\r\n\t${long.slice(75)}\r\nEND:VCALENDAR\r\n`
    const out = refoldIcs(byChars)
    expect(out.endsWith('\r\n')).toBe(true)
    expect(out.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/)
    for (const l of out.slice(0, -2).split('\r\n')) expect(octets(l)).toBeLessThanOrEqual(75)
    expect(unfold(out)).toBe(`BEGIN:VCALENDAR\r\n${long}\r\nEND:VCALENDAR\r\n`)
  })

  it('bare LF endings become CRLF', () => {
    expect(refoldIcs('BEGIN:VCALENDAR\nEND:VCALENDAR\n')).toBe('BEGIN:VCALENDAR\r\nEND:VCALENDAR\r\n')
  })
})
