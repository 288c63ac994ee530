// The firm's bank account for payment by transfer: its three parts as a UK payer's bank asks for
// them (account name, six-digit sort code, eight-digit account number), their checks, and how they
// read on an invoice, its page, a reminder and a claim letter. Pure.

export interface BankAccount { bankAccountName: string, bankSortCode: string, bankAccountNumber: string }

/** Only the digits: "12-34-56" and "12 34 56" are both 123456. */
export const digitsOnly = (v: string) => v.replace(/\D/g, '')

/** A sort code as people write it: 123456 -> "12-34-56". Anything not six digits is returned as given. */
export function formatSortCode(code: string): string {
  const d = digitsOnly(code)
  return d.length === 6 ? `${d.slice(0, 2)}-${d.slice(2, 4)}-${d.slice(4)}` : code
}

/** What is wrong with a sort code as typed, or null: six digits, with dashes or spaces allowed between pairs. */
export function sortCodeProblem(typed: string): string | null {
  const t = typed.trim()
  if (!/^\d{2}[- ]?\d{2}[- ]?\d{2}$/.test(t)) return 'A sort code is six digits, like 12-34-56.'
  return null
}

/**
 * What is wrong with an account number as typed, or null. UK account numbers are eight digits; a
 * few banks give seven or six, which the payer pads with noughts at the front, so those are asked
 * for as eight (common practice).
 */
export function accountNumberProblem(typed: string): string | null {
  const t = typed.trim().replace(/\s+/g, '')
  if (!/^\d+$/.test(t)) return 'An account number is digits only.'
  if (t.length !== 8) return 'An account number is eight digits. If yours is shorter, put noughts in front to make eight.'
  return null
}

/** All three parts are there, so a customer can pay by transfer. */
export const hasBankAccount = (a: Partial<BankAccount> | null | undefined): a is BankAccount =>
  !!a && !!a.bankAccountName?.trim() && digitsOnly(a.bankSortCode ?? '').length === 6 && digitsOnly(a.bankAccountNumber ?? '').length === 8

/** The account as lines for a page, PDF or letter: "Account name: …", "Sort code: 12-34-56", "Account number: 12345678". */
export function bankAccountLines(a: BankAccount): string[] {
  return [
    `Account name: ${a.bankAccountName.trim()}`,
    `Sort code: ${formatSortCode(a.bankSortCode)}`,
    `Account number: ${digitsOnly(a.bankAccountNumber)}`,
  ]
}

/** The account on one line, for an e-mail sentence: "Brackenridge Plastering, sort code 12-34-56, account 12345678". */
export const bankAccountInline = (a: BankAccount) =>
  `${a.bankAccountName.trim()}, sort code ${formatSortCode(a.bankSortCode)}, account ${digitsOnly(a.bankAccountNumber)}`

/** Why an invoice offering transfer cannot be issued yet (shown on the invoice, the 409 and the settings page). */
export const BANK_DETAILS_NEEDED = 'Add the firm\'s bank details (account name, sort code and account number) under Settings, Firm, so the customer can pay by transfer; or turn off payment by transfer there.'
