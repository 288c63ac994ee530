import { eq } from 'drizzle-orm'
import { firms } from '../../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { bankAccountLines, hasBankAccount } from '#shared/utils/bank-details'
import { fullDate } from '#shared/utils/dates'
import { makePdf, sendPdf } from '../../../../pdf/document'

/**
 * A letter to a business customer claiming statutory interest and the fixed sum on an overdue
 * invoice (server/utils/late-claim.ts). It is the firm's letter to its customer: it states the
 * debt, the interest (rate, days, amount) and the fixed sum, citing the Act, with dates in words
 * and the firm's bank account. The firm-facing caution (a rule of thumb, not legal advice) is on
 * the firm's claim screen only, never in the letter.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const { view, claim, asOf, bank } = await withFirm(auth, async (f) => {
    const c = await claimFor(f, id)
    const [bank] = await f.tx.select({ takesTransfer: firms.takesTransfer, bankAccountName: firms.bankAccountName, bankSortCode: firms.bankSortCode, bankAccountNumber: firms.bankAccountNumber }).from(firms).where(eq(firms.id, f.firmId))
    return { ...c, bank: bank!, view: await publicInvoiceView(f, id) }
  })
  const text = claimLetterText({
    reference: view.reference ?? '',
    issuedOn: view.issuedOn!,
    dueOn: view.dueOn!,
    debtPence: view.outstandingPence,
    asOf,
    claim,
    firmName: view.firm.tradingName,
    bankLines: bank.takesTransfer && hasBankAccount(bank) ? bankAccountLines(bank) : [],
  })
  const title = `Late payment claim: invoice ${view.reference}`
  const pdf = await makePdf({ title, subject: `Claim for ${view.customer.name}` }, (p) => {
    p.firmHeading(view.firm, 'Late payment claim', [fullDate(asOf), `Invoice ${view.reference}`], null)
    p.party('To', view.customer.name, [[view.customer.billingLine1, view.customer.billingTown, view.customer.billingPostcode].filter(Boolean).join(', ')])
    p.heading(text.heading)
    for (const para of text.paragraphs) p.para(para)
    p.footer(title, view.firm.tradingName)
  })
  return sendPdf(event, pdf, `claim-${(view.reference ?? 'invoice').replace(/[^\w-]/g, '-')}`)
})
