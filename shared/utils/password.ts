// Password rules for sign-up, invitations and password changes. Pure, so the form and the
// server give the same answer.

export const PASSWORD_MIN_LENGTH = 10
export const PASSWORD_MAX_LENGTH = 200

/**
 * A short list of passwords that are long enough but guessed first. Compared after lower-casing
 * and removing spaces. Not a substitute for a breach list; it stops the obvious ones.
 */
const COMMON = new Set([
  '1234567890', '12345678910', '0123456789', '0987654321', '1111111111', '1234512345', '1q2w3e4r5t',
  'qwertyuiop', 'qwerty1234', 'qwerty12345', 'asdfghjkl1', 'zxcvbnm123', 'q1w2e3r4t5',
  'password12', 'password123', 'password1234', 'passw0rd123', 'p@ssw0rd12', 'letmein123', 'welcome123',
  'iloveyou12', 'abc1234567', 'abcdefghij', 'aaaaaaaaaa', 'changeme123', 'trustno1234', 'football12',
  'liverpool1', 'arsenal123', 'chelsea123', 'manchester', 'plasterer1', 'plastering', 'password!!',
  'setwell123', 'setwell1234', 'adminadmin', 'administrator', 'starwars12', 'sunshine12', 'princess12',
])

export function passwordProblem(password: string, context: { email?: string, name?: string } = {}): string | null {
  if (password.length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters.`
  if (password.length > PASSWORD_MAX_LENGTH) return `Use at most ${PASSWORD_MAX_LENGTH} characters.`
  const folded = password.toLowerCase().replace(/\s+/g, '')
  if (COMMON.has(folded)) return 'That password is one of the first ones guessed. Choose another.'
  if (new Set(folded).size <= 2) return 'Use more than one or two different characters.'
  const email = context.email?.trim().toLowerCase()
  if (email && (folded === email || folded === email.split('@')[0])) return 'Do not use your e-mail address as the password.'
  const name = context.name?.trim().toLowerCase().replace(/\s+/g, '')
  if (name && name.length >= 4 && folded.includes(name) && folded.length - name.length < 4) return 'Do not build the password from your name.'
  return null
}
