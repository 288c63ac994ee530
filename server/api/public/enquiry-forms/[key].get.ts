import { formKeyParam } from '#shared/schemas/links'
/** Public: the firm's name for its enquiry form page. */
export default defineEventHandler(async (event) => {
  const { key } = await readParamsWith(event, formKeyParam)
  return useDb().transaction(async (tx) => {
    const firm = await firmByFormKey(tx, key)
    return { firmName: firm.tradingName, phone: firm.phone }
  })
})
