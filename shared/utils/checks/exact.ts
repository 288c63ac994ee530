// Checks and exact arithmetic shared by the pure money modules that take rows from the database
// (vat-return.ts, cis-summary.ts): each bad value is a RangeError naming its field; shares of pence
// are worked in BigInt and rounded once. In a folder of its own so Nuxt does not auto-import these
// short names into the app and the server.

/** RangeError naming the field unless value is a real ISO date (YYYY-MM-DD). */
export function isoDate(value: unknown, field: string): string {
  const m = typeof value === 'string' ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(value) : null
  if (!m) throw new RangeError(`${field} must be an ISO date (YYYY-MM-DD), got ${String(value)}`)
  const date = new Date(0)
  date.setUTCFullYear(Number(m[1]), Number(m[2]) - 1, Number(m[3])) // not Date.UTC, which reads 0 to 99 as 19xx
  if (date.getUTCFullYear() !== Number(m[1]) || date.getUTCMonth() !== Number(m[2]) - 1 || date.getUTCDate() !== Number(m[3])) {
    throw new RangeError(`${field} is not a real date: ${value as string}`)
  }
  return value as string
}

export function pence(value: unknown, field: string, min: 0 | null = 0): bigint {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || (min !== null && value < min)) {
    throw new RangeError(`${field} must be a whole number of pence${min === null ? '' : ', 0 or more'}, got ${String(value)}`)
  }
  return BigInt(value)
}

export function text(value: unknown, field: string): string {
  if (typeof value !== 'string') throw new RangeError(`${field} must be text, got ${String(value)}`)
  return value
}

/** n x num / den rounded to the nearest whole number, halves away from zero; den > 0. */
export function shareOf(n: bigint, num: bigint, den: bigint): bigint {
  const p = n * num
  const magnitude = ((p < 0n ? -p : p) * 2n + den) / (2n * den)
  return p < 0n ? -magnitude : magnitude
}

export function toSafe(n: bigint, field: string): number {
  const x = Number(n)
  if (!Number.isSafeInteger(x)) throw new RangeError(`${field} is too large`)
  return x
}
