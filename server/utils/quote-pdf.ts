// The PDF of a quote, drawn from the customer's view of it (publicQuoteView), so the firm's
// download and the customer's download say the same thing; the pieces are server/pdf/document.ts
// (the shipped fonts, no URL fetched, nothing outside the file).
import type { H3Event } from 'h3'
import { quotes, type quoteVersions } from '../db/schema'
import { planPictures, type RoomPicture } from '#shared/utils/room-picture'
import { planInputsFromRooms } from '#shared/utils/set-plan-inputs'
import { planSets } from '#shared/utils/set-plan'
import { AMBER, GREEN, formatUkDate, makePdf, sendPdf } from '../pdf/document'
import { drawRoomPicture } from '../pdf/room-picture'
import { publicQuoteView } from './public-quote'
import { currentVersion } from './quotes'

export type QuotePdfView = Awaited<ReturnType<typeof publicQuoteView>> & { issuedAt: Date | string | null, pictures?: RoomPicture[] }

const QUANTITIES_NOTE = 'Quantities are rules of thumb from the site measurements: they are estimates, checked on the day.'

/** The customer's view of a quote version, with the date it was issued (sent, or drafted). */
export async function quotePdfView(f: FirmScope, quote: typeof quotes.$inferSelect, version: typeof quoteVersions.$inferSelect): Promise<QuotePdfView> {
  const view = await publicQuoteView(f, quote, version)
  return { ...view, issuedAt: version.sentAt ?? version.createdAt, pictures: quote.visitId ? await workPictures(f, quote.visitId) : [] }
}

/** The measured rooms drawn with the sets the planner would make (the firm's figures, one person): "How we'll do the work". */
async function workPictures(f: FirmScope, visitId: string): Promise<RoomPicture[]> {
  const rooms = await loadRooms(f, visitId)
  if (!rooms.length) return []
  const book = await usePriceBook(f)
  if (!book.quoteWorkPage) return []
  try {
    const inputs = planInputsFromRooms(rooms, { cornerTrowelMm: book.cornerTrowelMm, outOfTrueToleranceMm: book.outOfTrueToleranceMm, minDeductCm2: book.minDeductCm2 })
    const plan = planSets(inputs.surfaces, inputs.corners, { ...(await defaultPlanOptions(f)), ceilingsFirst: book.ceilingsFirst }, inputs.labels)
    // laid out for the page's width in points (A4 less the margins), no taller than about half a page
    return planPictures(rooms, plan, { labels: inputs.labels, corners: inputs.corners, widthPx: 495, maxHeightPx: 360 })
  }
  catch (err) {
    // a room the planner cannot read leaves the page out; the quote itself is still drawn
    if (err instanceof RangeError) return []
    throw err
  }
}

const WORK_WORDS = 'We mix and lay on the plaster in batches called sets: each set is mixed, spread and trowelled smooth before it starts to harden. Below, each room is opened out flat: every wall and ceiling with the number of the set it is finished in. Patches are filled and gaps taped in earlier sets, so the finish dries evenly. On the day we may change the order to suit the room.'

/** The same view for the firm, of a quote's current version (404 for another firm's quote). */
export async function quoteViewForFirm(f: FirmScope, quoteId: string) {
  const quote = await findOr404(f, quotes, quoteId)
  const version = await currentVersion(f, quote)
  return quotePdfView(f, quote, version)
}

/** Hundredths of a day: 250 -> '2.5', 100 -> '1', 125 -> '1.25'. */
function days(x100: number) {
  const s = (x100 / 100).toFixed(2)
  return s.replace(/\.?0+$/, '')
}

/** Draw the quote; resolves to the PDF's bytes. */
export async function renderQuotePdf(view: QuotePdfView): Promise<Buffer> {
  const title = `Quote ${view.reference}, version ${view.version}`
  return makePdf({ title, subject: `Quote for ${view.customer.name}` }, (pdf) => {
    const firm = view.firm
    pdf.firmHeading(firm, title, [view.issuedAt ? `Date ${formatUkDate(view.issuedAt)}` : '', `Valid until ${formatUkDate(view.validUntil)}`], statusStamp(view))
    pdf.party('For', view.customer.name, view.site ? [`Site: ${[view.site.line1, view.site.town, view.site.postcode].filter(Boolean).join(', ')}`] : [])
    pdf.heading('The work')
    pdf.linesTable(view.lines)
    pdf.totals({ vat: view.vat, cisRatePercent: view.cisRatePercent, totals: view.totals as Record<string, number> }, firm.tradingName)

    // time, rules and cautions
    if (view.estimatedDaysX100 > 0) {
      pdf.heading('Time on site')
      pdf.para(`About ${days(view.estimatedDaysX100)} ${view.estimatedDaysX100 === 100 ? 'day' : 'days'} on site (an estimate).`)
    }
    const given = (view.rules ?? {}) as Record<string, unknown>
    const rules = [...new Set(['voids', 'narrow', 'days', ...Object.keys(given)])]
      .map(k => given[k]).filter((r): r is string => typeof r === 'string' && r.length > 0)
    pdf.heading('How we measured')
    for (const r of rules) pdf.para(r)
    pdf.para(QUANTITIES_NOTE)
    if (view.cautions.length) {
      pdf.heading('Please note')
      for (const c of view.cautions) pdf.para(c)
    }
    if (view.terms) {
      pdf.heading('Terms')
      pdf.para(view.terms)
    }
    if (view.notes) {
      pdf.heading('Notes')
      pdf.para(view.notes)
    }
    if (view.pictures?.length) {
      pdf.doc.addPage()
      pdf.heading('How we\'ll do the work')
      pdf.para(WORK_WORDS)
      for (const pic of view.pictures) drawRoomPicture(pdf, pic)
    }
    pdf.footer(title, firm.tradingName)
  })
}

function statusStamp(view: QuotePdfView): { text: string, color: string } | null {
  switch (view.status) {
    case 'accepted': return { text: `Accepted by ${view.acceptedName ?? 'the customer'}${view.respondedAt ? ` on ${formatUkDate(view.respondedAt)}` : ''}`, color: GREEN }
    case 'declined': return { text: `Declined${view.respondedAt ? ` on ${formatUkDate(view.respondedAt)}` : ''}`, color: AMBER }
    case 'superseded': return { text: 'Replaced by a newer version', color: AMBER }
    case 'draft': return { text: 'Draft: not yet sent', color: AMBER }
    default: return null
  }
}

/** Answer with the PDF as a download named after the quote's reference only. */
export async function sendQuotePdf(event: H3Event, view: QuotePdfView) {
  return sendPdf(event, await renderQuotePdf(view), /^[A-Z]+-Q\d+$/.test(view.reference) ? view.reference : 'quote')
}
