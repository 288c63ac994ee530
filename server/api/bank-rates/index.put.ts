import { z } from 'zod'
import { bankRates } from '../../db/schema'
import { isoDate } from '#shared/schemas/common'

const schema = z.object({
  rates: z.array(z.object({
    fromDate: isoDate('Pick the date the rate took effect.'),
    rateBp: z.int({ error: 'Enter the rate in hundredths of a percent (4.25% is 425).' }).min(0).max(2500, { error: 'Over 25%? Check the figure.' }),
  })).min(1, { error: 'Keep at least one rate.' }).max(200),
}).superRefine((v, ctx) => {
  const seen = new Set<string>()
  v.rates.forEach((r, i) => {
    if (seen.has(r.fromDate)) ctx.addIssue({ code: 'custom', path: ['rates', i, 'fromDate'], message: 'Two rates from the same day.' })
    seen.add(r.fromDate)
  })
})

/** Replace the firm's Bank Rate table (the owner keeps it up to date from the Bank of England's figures). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  const { rates } = await readBodyWith(event, schema)
  return withFirm(auth, async (f) => {
    await f.tx.delete(bankRates).where(f.where(bankRates))
    await f.tx.insert(bankRates).values(rates.map(r => f.values(r)))
    await f.audit('bank-rates.changed', 'firm', f.firmId, { count: rates.length })
    return bankRateTable(f)
  })
})
