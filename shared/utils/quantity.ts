// Quantities on quotes and invoices are whole thousandths of their unit (12.345 m² is 12345).

/** '12.345', '12,5', '3' -> thousandths; null when it is not a quantity (more than 3 decimals, negative, text). */
export function parseQuantity(input: string): number | null {
  const m = /^(\d{1,6})(?:[.,](\d{0,3}))?$/.exec(input.trim())
  if (!m) return null
  return Number(m[1]) * 1000 + Number((m[2] ?? '').padEnd(3, '0'))
}

/** Thousandths as people write them: 8400 -> '8.40', 12345 -> '12.345', 3000 -> '3'. */
export function formatQuantity(x1000: number): string {
  const whole = Math.floor(x1000 / 1000)
  const frac = x1000 % 1000
  if (frac === 0) return String(whole)
  const digits = String(frac).padStart(3, '0')
  return `${whole}.${digits.endsWith('0') ? digits.replace(/0$/, '') : digits}`
}

/** Thousandths as a plain count with no trailing zeros: 1500 -> '1.5', 2000 -> '2', 1250 -> '1.25'. */
export function formatCount(x1000: number): string {
  const sign = x1000 < 0 ? '-' : ''
  const a = Math.abs(x1000)
  const frac = String(a % 1000).padStart(3, '0').replace(/0+$/, '')
  return `${sign}${Math.floor(a / 1000)}${frac ? `.${frac}` : ''}`
}
