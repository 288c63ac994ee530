// Why a screen shows values it cannot change, in the firm's words (shown by <FormReadOnly>).
import { longIsoDate } from '#shared/utils/dates'
import type { Role } from '#shared/utils/roles'

/** The role's reason, when the role itself may not change the thing (the accountant reads everything, changes nothing). */
export function roleReadOnlyReason(role: Role | undefined, what: string): string {
  if (role === 'accountant') return `As the firm's accountant you can read ${what} and download the figures, but not change them.`
  return `Your role in the firm can read ${what} but not change it; the owner or the office can.`
}

/** An invoice or credit note that has been issued: it keeps its number and never changes. */
export function issuedReadOnlyReason(kind: 'invoice' | 'credit-note', issuedOn: string | null | undefined): string {
  const when = issuedOn ? ` on ${longIsoDate(issuedOn)}` : ''
  return kind === 'credit-note'
    ? `Issued${when}: an issued credit note keeps its number and never changes.`
    : `Issued${when}: an issued invoice keeps its number and never changes. To correct it, make a credit note below.`
}

/** A quote that is no longer a draft: what it is, and what can be done instead of changing it. */
export function quoteReadOnlyReason(status: 'sent' | 'accepted' | 'declined' | 'superseded', canRevise: boolean): string {
  const revise = canRevise ? ' Revise it to make a new version to change.' : ''
  switch (status) {
    case 'sent': return `Sent to the customer: a sent quote does not change, so what they read stays what you offered.${revise}`
    case 'accepted': return 'Accepted by the customer: it stays as they accepted it.'
    case 'declined': return `Declined by the customer: it stays as it was sent.${revise}`
    case 'superseded': return 'Replaced by a newer version: it stays as it was sent.'
  }
}
