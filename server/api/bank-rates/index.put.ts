import { bankRates } from '../../db/schema'
import { bankRatesSchema } from '#shared/schemas/firm'

/** Replace the firm's Bank Rate table (the owner keeps it up to date from the Bank of England's figures). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  const { rates } = await readBodyWith(event, bankRatesSchema)
  return withFirm(auth, async (f) => {
    await f.tx.delete(bankRates).where(f.where(bankRates))
    await f.tx.insert(bankRates).values(rates.map(r => f.values(r)))
    await f.audit('bank-rates.changed', 'firm', f.firmId, { count: rates.length })
    return bankRateTable(f)
  })
})
