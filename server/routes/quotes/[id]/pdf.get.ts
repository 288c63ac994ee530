import { idParam } from '#shared/schemas/common'

/**
 * The firm's PDF of a quote's current version: `/quotes/<id>/pdf`. (A file named `[id].pdf.get.ts`
 * would be the route `/quotes/:id.pdf`, whose parameter is called `id.pdf` and which also answers
 * `/quotes/<id>`, hiding the quote's page; so the PDF lives one level down.)
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const view = await withFirm(auth, f => quoteViewForFirm(f, id))
  return sendQuotePdf(event, view)
})
