// Dates in the browser: today as the person's own calendar day, and ISO dates as people read them.

/** The person's calendar day (not UTC's) as YYYY-MM-DD. */
export function localIsoDate(d = new Date()): string {
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`
}

const longFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })

/** '2026-09-30' -> '30 Sept 2026'. */
export function longIsoDate(iso: string): string {
  return longFormat.format(new Date(`${iso}T00:00:00Z`))
}
