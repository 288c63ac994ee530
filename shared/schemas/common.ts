import { z } from 'zod'
import { passwordProblem } from '../utils/password'

export const emailField = z.string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .min(1, { error: 'Enter an e-mail address.' })
  .max(254, { error: 'That e-mail address is too long.' })
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.co.uk.' }))

export const nameField = (what = 'a name') => z.string({ error: `Enter ${what}.` })
  .trim()
  .min(1, { error: `Enter ${what}.` })
  .max(120, { error: 'Keep it under 120 characters.' })

/** A new password: the rules in shared/utils/password.ts. */
export const newPasswordField = z.string({ error: 'Enter a password.' }).superRefine((value, ctx) => {
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
