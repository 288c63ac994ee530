// iCalendar text (RFC 5545, 3.1 "Content Lines"): lines end in CRLF and are folded so that no
// line is longer than 75 octets, a continuation line starting with one space. The `ics` package
// folds at 75 characters, so a line with accents or dashes (2 or 3 octets each in UTF-8) comes
// out too long; this refolds its output by octets, never inside a character. Pure.

const MAX_OCTETS = 75

function octets(ch: string): number {
  const cp = ch.codePointAt(0)!
  return cp < 0x80 ? 1 : cp < 0x800 ? 2 : cp < 0x10000 ? 3 : 4
}

/** One unfolded content line, folded at 75 octets (continuations start with a space, which counts). */
export function foldIcsLine(line: string): string {
  const out: string[] = []
  let current = ''
  let size = 0
  for (const ch of line) {
    const n = octets(ch)
    if (size + n > MAX_OCTETS) {
      out.push(current)
      current = ' '
      size = 1
    }
    current += ch
    size += n
  }
  out.push(current)
  return out.join('\r\n')
}

/** iCalendar text unfolded, then folded again by octets, every line ending in CRLF. */
export function refoldIcs(text: string): string {
  const lines = text.replace(/\r?\n[ \t]/g, '').split(/\r?\n/)
  while (lines.length && lines[lines.length - 1] === '') lines.pop()
  return lines.map(foldIcsLine).join('\r\n') + '\r\n'
}
