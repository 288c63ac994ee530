import { z } from 'zod'
import { addDays } from '../utils/dates'
import { passwordProblem } from '../utils/password'

// Every schema in shared/schemas and server/ builds its text and dates from here, so no route can
// forget what PostgreSQL and the date code cannot take (tests/unit/schema-fields.test.ts fails on a
// raw z.string() or z.iso.* elsewhere):
// - text refuses NUL (PostgreSQL's text refuses it), the other C0 control characters except tab,
//   line feed and carriage return (invisible, and they break CSV, PDF and e-mail), and half of a
//   surrogate pair on its own (not a character: jsonb and UTF-8 refuse it). Tab and line breaks are
//   allowed in every field, one-line ones too: they are harmless to store and trim at the ends.
// - dates are real calendar dates (z.iso.date checks the day of the month and 29 February) from
//   1 January 1900 to 31 December 2100; date-times are in that span too, read with their offset.
// server/utils/validate.ts refuses NUL and lone surrogates anywhere in a body or query as well,
// even where a schema takes anything (the rows of a customer import).

export const UNUSUAL_CHARACTER = 'Remove the unusual character from this text (an invisible control character, or half of an emoji).'
export const FIRST_DAY = '1900-01-01'
export const LAST_DAY = '2100-12-31'
export const DATE_RANGE = 'Pick a date between 1 January 1900 and 31 December 2100.'

/** A NUL or half of a surrogate pair on its own: what no text column, jsonb or UTF-8 can hold. */
export function hasBrokenCharacter(s: string): boolean {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i)
    if (c === 0) return true
    if (c >= 0xD800 && c <= 0xDBFF) {
      const next = s.charCodeAt(i + 1)
      if (next >= 0xDC00 && next <= 0xDFFF) i++
      else return true
    }
    else if (c >= 0xDC00 && c <= 0xDFFF) {
      return true
    }
  }
  return false
}

/**
 * The path of the first string (or object key) holding a NUL or a lone surrogate; null when there
 * is none. Walked with a stack of nodes that point at their parent, so a body nested 100,000 deep
 * (a 256 KiB body of brackets) costs one step a value, with no recursion and no copied paths.
 */
export function brokenTextAt(value: unknown): (string | number)[] | null {
  interface Node { value: unknown, key: string | number, parent: Node | null }
  const pathOf = (node: Node | null, last?: string): (string | number)[] => {
    const path: (string | number)[] = last === undefined ? [] : [last]
    for (let n = node; n?.parent; n = n.parent) path.push(n.key)
    return path.reverse()
  }
  const stack: Node[] = [{ value, key: '', parent: null }]
  while (stack.length) {
    const node = stack.pop()!
    const v = node.value
    if (typeof v === 'string') {
      if (hasBrokenCharacter(v)) return pathOf(node)
    }
    else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ value: v[i], key: i, parent: node })
    }
    else if (v !== null && typeof v === 'object') {
      const entries = Object.entries(v)
      for (const [k] of entries) if (hasBrokenCharacter(k)) return pathOf(node, k)
      for (let i = entries.length - 1; i >= 0; i--) stack.push({ value: entries[i]![1], key: entries[i]![0], parent: node })
    }
  }
  return null
}

/** hasBrokenCharacter, or a C0 control character other than tab, line feed and carriage return. */
export function hasUnusualCharacter(s: string): boolean {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i)
    if (c < 0x20 && c !== 0x09 && c !== 0x0A && c !== 0x0D) return true
  }
  return hasBrokenCharacter(s)
}

/** Text a person typed (or a program sent): a string with no unusual character; chain .trim(), .min(), .max() as with z.string(). */
export const text = (params?: { error?: string }) => z.string(params).refine(s => !hasUnusualCharacter(s), { error: UNUSUAL_CHARACTER })

const DATE_SHAPE = /^\d{4}-\d{2}-\d{2}/
const FIRST_MS = Date.parse(`${FIRST_DAY}T00:00:00Z`)
const AFTER_LAST_MS = Date.parse(`${addDays(LAST_DAY, 1)}T00:00:00Z`)

/** A calendar date, YYYY-MM-DD, from 1900 to 2100. */
export const isoDate = (error = 'Pick a date (YYYY-MM-DD).') => z.iso.date({ error })
  .refine(d => !DATE_SHAPE.test(d) || (d >= FIRST_DAY && d <= LAST_DAY), { error: DATE_RANGE })

/** A date and time with its offset (ISO 8601), whose moment falls from 1900 to 2100 (UTC). */
export const isoDateTime = (error = 'Pick a date and time.') => z.iso.datetime({ offset: true, error })
  .refine((v) => {
    const ms = Date.parse(v)
    return !DATE_SHAPE.test(v) || Number.isNaN(ms) || (ms >= FIRST_MS && ms < AFTER_LAST_MS)
  }, { error: DATE_RANGE })

/** A whole number in a query string ("2"), from min to max, with a default when left out. */
export const queryWholeNumber = (what: string, min: number, max: number, fallback: number) => {
  const error = `${what} is a whole number from ${min} to ${max}.`
  return z.coerce.number({ error }).int({ error }).min(min, { error }).max(max, { error }).default(fallback)
}

export const emailField = text({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .min(1, { error: 'Enter an e-mail address.' })
  .max(254, { error: 'That e-mail address is too long.' })
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.co.uk.' }))

export const nameField = (what = 'a name') => text({ error: `Enter ${what}.` })
  .trim()
  .min(1, { error: `Enter ${what}.` })
  .max(120, { error: 'Keep it under 120 characters.' })

/** A new password: the rules in shared/utils/password.ts. */
export const newPasswordField = text({ error: 'Enter a password.' }).superRefine((value, ctx) => {
  const problem = passwordProblem(value)
  if (problem) ctx.addIssue({ code: 'custom', message: problem })
})

export const idParam = z.object({ id: z.uuid({ error: 'Not found.' }) })

/** Turn zod issues into `{ field: message }`, first message per field, for showing beside the field. */
export function fieldErrors(issues: readonly { path: PropertyKey[], message: string }[]): Record<string, string> {
  const out: Record<string, string> = {}
  for (const issue of issues) {
    const key = issue.path.map(String).join('.') || '_'
    if (!(key in out)) out[key] = issue.message
  }
  return out
}

/**
 * For cross-field rules that run even while other fields have errors (so every problem shows at
 * once): run them only on an object, never on a body that is null, an array or a string, where
 * reading its fields would throw instead of naming the problem.
 */
export const whenObject = (payload: { value: unknown }) => typeof payload.value === 'object' && payload.value !== null && !Array.isArray(payload.value)
