import { idParam } from '#shared/schemas/common'
import { formatPence } from '#shared/utils/money'
import { formatUkDate, makePdf, MUTED, sendPdf } from '../../../../pdf/document'

/** A letter claiming statutory interest and the fixed sum on a business customer's overdue invoice. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const { view, claim, asOf, caution } = await withFirm(auth, async (f) => {
    const c = await claimFor(f, id)
    return { ...c, view: await publicInvoiceView(f, id) }
  })
  const title = `Late payment claim: invoice ${view.reference}`
  const pdf = await makePdf({ title, subject: `Claim for ${view.customer.name}` }, (p) => {
    p.firmHeading(view.firm, 'Late payment claim', [`Date ${formatUkDate(asOf)}`, `Invoice ${view.reference}`], null)
    p.party('To', view.customer.name, [[view.customer.billingLine1, view.customer.billingTown, view.customer.billingPostcode].filter(Boolean).join(', ')])
    p.heading(`Invoice ${view.reference}, due ${formatUkDate(view.dueOn)}`)
    p.para(`Our invoice ${view.reference} of ${formatUkDate(view.issuedOn)} was due for payment by ${formatUkDate(view.dueOn)}. ${formatPence(view.outstandingPence)} is still unpaid.`)
    p.para('Under the Late Payment of Commercial Debts (Interest) Act 1998 we claim statutory interest and a fixed sum for the cost of recovering the debt:')
    p.para(`Interest from ${formatUkDate(claim.interestStart)} to ${formatUkDate(asOf)} (${claim.days} days) at ${claim.ratePercent}% a year (8% over the Bank of England reference rate): ${formatPence(claim.interestPence)}.`)
    p.para(`Fixed sum (section 5A): ${formatPence(claim.fixedSumPence)}.`)
    p.para(`Total now due: ${formatPence(claim.totalPence)}. Interest continues to run until the debt is paid.`)
    if (view.bank) p.para(`Please pay by bank transfer, quoting ${view.reference}: ${view.bank.join(', ')}.`)
    p.heading('Please note')
    p.para(caution, MUTED)
    p.footer(title, view.firm.tradingName)
  })
  return sendPdf(event, pdf, `claim-${(view.reference ?? 'invoice').replace(/[^\w-]/g, '-')}`)
})
