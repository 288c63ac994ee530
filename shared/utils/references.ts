// The references people read and say on the phone. Every one starts with the firm's letters (the
// initials of its trading name: Brackenridge Plastering gives BP), then a letter for the kind:
// job BP-J7, quote BP-Q12, invoice BP-12, credit note BP-C3. No padding: the number is as it is.
// A firm may set its own invoice and credit-note prefixes; blank means the defaults below.
// One definition for the server, the pages and the demo data alike; pages never rebuild one.

/** Words left out of a trading name's initials. The same list as migration 0027's back-fill. */
const LEFT_OUT = new Set(['ltd', 'limited', 'and', 'the', 'of', 'plc', 'llp', 'co'])

/**
 * The firm's letters from its trading name: the first letter of each word, up to three, leaving out
 * Ltd, and, the... ("Brackenridge Plastering Ltd" -> "BP"); "S" when nothing is left. Words are runs
 * of A to Z, as in the migration's SQL, so the firms made before and after agree.
 */
export function firmLetters(tradingName: string): string {
  const initials = tradingName.split(/[^A-Za-z]+/)
    .filter(word => word !== '' && !LEFT_OUT.has(word.toLowerCase()))
    .map(word => word[0]!.toUpperCase())
    .join('')
  return initials.slice(0, 3) || 'S'
}

/** What comes before a job's number: BP-J. */
export const jobPrefix = (letters: string) => `${letters}-J`

/** A job's reference: BP-J7. */
export const jobReference = (letters: string, n: number) => `${jobPrefix(letters)}${n}`

/** A quote's reference: BP-Q12. */
export const quoteReference = (letters: string, n: number) => `${letters}-Q${n}`

/** The prefix an invoice is numbered under: the firm's own, or its letters and a dash (BP-). */
export const invoicePrefixOf = (letters: string, prefix: string) => prefix || `${letters}-`

/** The prefix a credit note in its own series is numbered under: the firm's own, or its letters and -C (BP-C). */
export const creditNotePrefixOf = (letters: string, prefix: string) => prefix || `${letters}-C`

/** An invoice's or credit note's reference: the prefix then the number, BP-12. */
export const invoiceReference = (prefix: string, n: number) => `${prefix}${n}`
