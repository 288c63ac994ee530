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

/**
 * A visit in a person's calendar feed. The feed is a calendar an app subscribes to and reads
 * again whole (not an invitation sent by e-mail), so:
 * - a moved visit keeps its UID and its SEQUENCE goes up by one for each move (RFC 5545, 3.8.7.4),
 *   so an app that kept the old copy knows this one replaces it;
 * - a cancelled visit is left out. A published feed that drops an event is read the same way by
 *   every app that subscribes (the event goes); STATUS:CANCELLED is the way to cancel in an
 *   invitation (iTIP, RFC 5546), and apps that subscribe handle it unevenly, some still showing the
 *   visit. The feed already leaves out cancelled jobs the same way;
 * - a done visit stays as it was (it happened at that time).
 */
export function visitFeedEntry(v: { id: string, status: 'booked' | 'done' | 'cancelled', startsAt: Date, durationMinutes: number }, moves: number) {
  if (v.status === 'cancelled') return null
  return {
    uid: `visit-${v.id}@setwell`,
    sequence: moves,
    startMs: v.startsAt.getTime(),
    endMs: v.startsAt.getTime() + v.durationMinutes * 60_000,
  }
}
