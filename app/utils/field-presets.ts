/**
 * How the fields every sign-in, sign-up and contact form asks for are typed, in one place: the
 * label, the name the API reads, and what the phone's keyboard and password manager should offer.
 * A FormField with `preset="email"` takes these; any prop given beside it wins.
 */
export interface FieldPreset {
  label: string
  name: string
  type?: string
  inputmode?: 'text' | 'email' | 'tel'
  autocomplete: string
  hint?: string
}

export const FIELD_PRESETS = {
  'your-name': { label: 'Your name', name: 'name', autocomplete: 'name' },
  'email': { label: 'E-mail', name: 'email', type: 'email', inputmode: 'email', autocomplete: 'email' },
  'phone': { label: 'Phone (optional)', name: 'phone', type: 'tel', inputmode: 'tel', autocomplete: 'tel' },
  'new-password': { label: 'Password', name: 'password', type: 'password', autocomplete: 'new-password', hint: 'At least 10 characters. A short sentence is easy to remember.' },
  'current-password': { label: 'Password', name: 'password', type: 'password', autocomplete: 'current-password' },
} satisfies Record<string, FieldPreset>

export type FieldPresetName = keyof typeof FIELD_PRESETS
