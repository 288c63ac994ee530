// Measurements as people type them and as we store them. Lengths are whole millimetres, areas
// whole square centimetres; the screen shows metres and square metres with two decimals.
// Integer arithmetic throughout, so 2.55 x 5.2 is 13.26 and never 13.259999.

/** '2.4', '2.40', '2,4' (a comma as the decimal mark), '2' -> millimetres; null if not a length. Up to 3 decimals. */
export function parseMetres(input: string): number | null {
  const m = /^(\d{0,3})(?:\.(\d{0,3}))?$/.exec(input.trim().replace(',', '.'))
  if (!m || (m[1] === '' && !m[2])) return null
  return Number(m[1] || '0') * 1000 + Number((m[2] ?? '').padEnd(3, '0'))
}

function hundredths(n: number): string {
  const sign = n < 0 ? '-' : ''
  const abs = Math.abs(n)
  return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`
}

/** Millimetres as metres with two decimals, rounded half up: 2405 -> '2.41'. */
export function formatMetres(mm: number): string {
  return hundredths(Math.round(mm / 10))
}

/** Square centimetres as square metres with two decimals, rounded half up: 132600 -> '13.26'. */
export function formatSquareMetres(cm2: number): string {
  return hundredths(Math.round(cm2 / 100))
}

/** '1.5' m² -> 15000 cm²; null if not an area. Two decimals at most. */
export function parseSquareMetres(input: string): number | null {
  const m = /^(\d{1,4})(?:[.,](\d{0,2}))?$/.exec(input.trim())
  if (!m) return null
  return Number(m[1]) * 10_000 + Number((m[2] ?? '').padEnd(2, '0') || '0') * 100
}

/** The area of a rectangle in mm, as whole square centimetres (rounded half up). */
export function rectCm2(aMm: number, bMm: number): number {
  return Math.round((aMm * bMm) / 100)
}
