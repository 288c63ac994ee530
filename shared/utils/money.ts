// Money is an integer number of pence everywhere. dinero.js does the arithmetic and the decimal
// conversion; these helpers read what a person types and write what a person reads.
import { dinero, toDecimal } from 'dinero.js'
import { GBP } from 'dinero.js/currencies'

const POUNDS = /^£?(\d{1,3}(?:,\d{3})+|\d+)?(?:\.(\d{1,2}))?$/
const gbp = new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' })

/** '1,234.5' or '£180' to pence (123450, 18000); null when it is not an amount of money. */
export function parsePounds(input: string): number | null {
  const s = input.trim().replace(/\s+/g, '')
  const m = POUNDS.exec(s)
  if (!m || (m[1] === undefined && m[2] === undefined)) return null
  const whole = Number((m[1] ?? '0').replaceAll(',', ''))
  const frac = Number((m[2] ?? '').padEnd(2, '0') || '0')
  const pence = whole * 100 + frac
  return Number.isSafeInteger(pence) ? pence : null
}

/** Pence as a decimal string of pounds: 123450 -> '1234.50'. */
export function penceToDecimal(pence: number): string {
  if (!Number.isSafeInteger(pence)) throw new RangeError(`pence must be a whole number, got ${pence}`)
  return toDecimal(dinero({ amount: pence, currency: GBP }))
}

/** Pence for people: 123450 -> '£1,234.50', -500 -> '-£5.00'. */
export function formatPence(pence: number): string {
  // Intl formats the exact decimal string; no float division
  return gbp.format(penceToDecimal(pence) as unknown as number)
}
