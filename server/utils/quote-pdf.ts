// The PDF of a quote, drawn with pdfkit from the customer's view of it (publicQuoteView), so the
// firm's download and the customer's download say the same thing. The fonts are the app's own
// Atkinson Hyperlegible (WOFF 1, which pdfkit embeds; it cannot embed WOFF2), bundled into the
// server by Nitro's raw imports: no font is read from a URL or from disk at run time, and the
// PDF refers to nothing outside itself.
import PDFDocument from 'pdfkit'

import type { H3Event } from 'h3'
import type { quotes, quoteVersions } from '../db/schema'
import { formatPence } from '#shared/utils/money'
import { lineNetPence } from '#shared/utils/tax'
import { publicQuoteView } from './public-quote'
import { currentVersion, findQuote } from './quotes'
import { drawAnyLatin } from '../pdf/text'

export type QuotePdfView = Awaited<ReturnType<typeof publicQuoteView>> & { issuedAt: Date | string | null }

const QUANTITIES_NOTE = 'Quantities are rules of thumb from the site measurements: they are estimates, checked on the day.'

/** The customer's view of a quote version, with the date it was issued (sent, or drafted). */
export async function quotePdfView(f: FirmScope, quote: typeof quotes.$inferSelect, version: typeof quoteVersions.$inferSelect): Promise<QuotePdfView> {
  const view = await publicQuoteView(f, quote, version)
  return { ...view, issuedAt: version.sentAt ?? version.createdAt }
}

/** The same view for the firm, of a quote's current version (404 for another firm's quote). */
export async function quoteViewForFirm(f: FirmScope, quoteId: string) {
  const quote = await findQuote(f, quoteId)
  const version = await currentVersion(f, quote)
  return quotePdfView(f, quote, version)
}

const ukDate = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'Europe/London' })

/** '2026-12-31' or a Date as '31 December 2026'. */
function formatUkDate(value: Date | string | null | undefined): string {
  if (!value) return ''
  const d = typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value) ? new Date(`${value}T12:00:00Z`) : new Date(value)
  return Number.isNaN(d.getTime()) ? String(value) : ukDate.format(d)
}

/** Thousandths of a unit for a quote: 3000 bags -> '3', 12000 m² -> '12.00', 8400 -> '8.40', 12345 -> '12.345'. */
function pdfQuantity(x1000: number, unit: string): string {
  if (x1000 % 1000 === 0) return /^(m|m²|m2|lm|m³)$/.test(unit.trim()) ? `${x1000 / 1000}.00` : String(x1000 / 1000)
  const sign = x1000 < 0 ? '-' : ''
  const abs = Math.abs(x1000)
  const frac = String(abs % 1000).padStart(3, '0')
  return `${sign}${Math.floor(abs / 1000)}.${frac.endsWith('0') ? frac.slice(0, 2) : frac}`
}

/** Hundredths of a day: 250 -> '2.5', 100 -> '1', 125 -> '1.25'. */
function days(x100: number) {
  const s = (x100 / 100).toFixed(2)
  return s.replace(/\.?0+$/, '')
}

const INK = '#1f2933'
const MUTED = '#52606d'
const RULE = '#cbd2d9'
const GREEN = '#1d6b3a'
const AMBER = '#7a4b00'

/** Draw the quote; resolves to the PDF's bytes. */
export async function renderQuotePdf(view: QuotePdfView): Promise<Buffer> {
  const fonts = await import('../pdf/fonts')
  const regular = Buffer.from(fonts.regularWoff)
  const bold = Buffer.from(fonts.boldWoff)
  const title = `Quote ${view.reference}, version ${view.version}`
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: 50, bottom: 60, left: 50, right: 50 },
    bufferPages: true,
    // our font from the start, so pdfkit never loads its built-in Helvetica (no £ in it for us)
    font: regular as unknown as string,
    info: { Title: title, Author: 'Setwell', Creator: 'Setwell', Producer: 'Setwell', Subject: `Quote for ${view.customer.name}` },
    lang: 'en-GB',
    displayTitle: true,
  } as PDFKit.PDFDocumentOptions)
  doc.registerFont('regular', regular)
  doc.registerFont('bold', bold)
  doc.registerFont('regular-ext', Buffer.from(fonts.regularExtWoff))
  doc.registerFont('bold-ext', Buffer.from(fonts.boldExtWoff))
  drawAnyLatin(doc)

  const chunks: Buffer[] = []
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })

  const left = doc.page.margins.left
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right
  const bottom = () => doc.page.height - doc.page.margins.bottom
  const ensure = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage()
  }
  const heading = (text: string) => {
    ensure(40)
    doc.moveDown(0.8).font('bold').fontSize(12).fillColor(INK).text(text, left, doc.y, { width })
    doc.moveDown(0.2)
  }
  const para = (text: string, color = INK, size = 10) => {
    if (!text) return
    ensure(doc.font('regular').fontSize(size).heightOfString(text, { width }) + 4)
    doc.font('regular').fontSize(size).fillColor(color).text(text, left, doc.y, { width })
    doc.moveDown(0.3)
  }

  // the firm, on the left; the quote's particulars on the right
  const firm = view.firm
  const top = doc.y
  doc.font('bold').fontSize(18).fillColor(INK).text(firm.tradingName, left, top, { width: width * 0.55 })
  doc.font('regular').fontSize(10).fillColor(MUTED)
  const firmLines = [
    [firm.addressLine1, firm.town, firm.postcode].filter(Boolean).join(', '),
    firm.phone ? `Phone ${firm.phone}` : '',
    firm.email ? `E-mail ${firm.email}` : '',
    firm.vatRegistered && firm.vatNumber ? `VAT number ${firm.vatNumber}` : '',
  ].filter(Boolean)
  for (const l of firmLines) doc.text(l, left, doc.y, { width: width * 0.55 })
  const firmBottom = doc.y

  const rightX = left + width * 0.58
  const rightW = width * 0.42
  doc.font('bold').fontSize(14).fillColor(INK).text(title, rightX, top, { width: rightW, align: 'right' })
  doc.font('regular').fontSize(10).fillColor(MUTED)
  if (view.issuedAt) doc.text(`Date ${formatUkDate(view.issuedAt)}`, rightX, doc.y, { width: rightW, align: 'right' })
  doc.text(`Valid until ${formatUkDate(view.validUntil)}`, rightX, doc.y, { width: rightW, align: 'right' })
  const stamp = statusStamp(view)
  if (stamp) {
    doc.moveDown(0.4)
    const y = doc.y
    doc.font('bold').fontSize(10)
    const h = doc.heightOfString(stamp.text, { width: rightW - 12 }) + 10
    doc.lineWidth(1.5).strokeColor(stamp.color).rect(rightX, y, rightW, h).stroke()
    doc.fillColor(stamp.color).text(stamp.text, rightX + 6, y + 5, { width: rightW - 12, align: 'right' })
    doc.y = y + h
  }
  doc.y = Math.max(doc.y, firmBottom) + 16

  // who and where
  doc.font('bold').fontSize(10).fillColor(MUTED).text('For', left, doc.y, { width })
  doc.font('bold').fontSize(12).fillColor(INK).text(view.customer.name, left, doc.y, { width })
  if (view.site) {
    doc.font('regular').fontSize(10).fillColor(INK).text(`Site: ${[view.site.line1, view.site.town, view.site.postcode].filter(Boolean).join(', ')}`, left, doc.y, { width })
  }

  // the lines
  heading('The work')
  const cols = [
    { label: 'Description', w: width * 0.52, align: 'left' as const },
    { label: 'Quantity', w: width * 0.16, align: 'right' as const },
    { label: 'Unit price', w: width * 0.15, align: 'right' as const },
    { label: 'Net', w: width * 0.17, align: 'right' as const },
  ]
  const row = (cells: string[], font: 'regular' | 'bold', color = INK) => {
    doc.font(font).fontSize(10)
    const h = Math.max(...cells.map((c, i) => doc.heightOfString(c, { width: cols[i]!.w - 6 }))) + 6
    if (doc.y + h > bottom()) {
      doc.addPage()
      if (font === 'regular') row(cols.map(c => c.label), 'bold', MUTED)
      doc.font(font).fontSize(10)
    }
    const y = doc.y
    let x = left
    cells.forEach((c, i) => {
      doc.fillColor(color).text(c, x + (i ? 6 : 0), y + 3, { width: cols[i]!.w - 6, align: cols[i]!.align })
      x += cols[i]!.w
    })
    doc.lineWidth(0.5).strokeColor(RULE).moveTo(left, y + h).lineTo(left + width, y + h).stroke()
    doc.y = y + h
  }
  row(cols.map(c => c.label), 'bold', MUTED)
  for (const kind of ['labour', 'materials'] as const) {
    const lines = view.lines.filter(l => l.kind === kind)
    if (!lines.length) continue
    for (const l of lines) {
      const net = lineNetPence({ quantity: l.quantityX1000 / 1000, unitPence: l.unitPence })
      row([l.description, `${pdfQuantity(l.quantityX1000, l.unit)} ${l.unit}`, formatPence(l.unitPence), formatPence(net)], 'regular')
    }
  }

  // the totals, right-aligned
  const t = view.totals as Record<string, number>
  const money = (k: string) => formatPence(t[k] ?? 0)
  doc.moveDown(0.6)
  const totalRow = (label: string, value: string, strong = false) => {
    ensure(18)
    const y = doc.y
    doc.font(strong ? 'bold' : 'regular').fontSize(strong ? 12 : 10).fillColor(INK)
    doc.text(label, left, y, { width: width * 0.78, align: 'right' })
    const after = doc.y
    doc.text(value, left + width * 0.78, y, { width: width * 0.22, align: 'right' })
    doc.y = Math.max(after, doc.y) + 2
  }
  totalRow('Labour', money('labourNetPence'))
  totalRow('Materials', money('materialsNetPence'))
  totalRow('Net total', money('netPence'))
  if (view.vat === 'standard') totalRow('VAT', money('vatPence'))
  else if (view.vat === 'not-registered') totalRow('VAT (not VAT-registered: no VAT is charged)', money('vatPence'))
  else totalRow('VAT (reverse charge, not charged)', money('vatPence'))
  totalRow('Total', money('grossPence'), true)
  if (view.vat === 'reverse-charge') {
    doc.moveDown(0.3)
    para(`Reverse charge: customer to pay the VAT to HMRC. The VAT the customer accounts for is ${money('reverseChargeVatPence')}.`)
  }
  if (view.vat === 'not-registered') para(`${firm.tradingName} is not VAT-registered: no VAT is charged.`, MUTED)
  if (view.cisRatePercent !== null && view.cisRatePercent !== undefined) {
    doc.moveDown(0.3)
    if (view.cisRatePercent > 0) {
      para(`CIS: the contractor deducts ${view.cisRatePercent}% from the labour under the Construction Industry Scheme (${money('cisDeductionPence')}) and pays it to HMRC. Amount payable after the deduction: ${money('amountDuePence')}.`)
    }
    else para('CIS: paid gross under the Construction Industry Scheme, with no deduction.')
  }

  // time, rules and cautions
  if (view.estimatedDaysX100 > 0) {
    heading('Time on site')
    para(`About ${days(view.estimatedDaysX100)} ${view.estimatedDaysX100 === 100 ? 'day' : 'days'} on site (an estimate).`)
  }
  const given = (view.rules ?? {}) as Record<string, unknown>
  const rules = [...new Set(['voids', 'narrow', 'days', ...Object.keys(given)])]
    .map(k => given[k]).filter((r): r is string => typeof r === 'string' && r.length > 0)
  heading('How we measured')
  for (const r of rules) para(r)
  para(QUANTITIES_NOTE)
  if (view.cautions.length) {
    heading('Please note')
    for (const c of view.cautions) para(c)
  }
  if (view.terms) {
    heading('Terms')
    para(view.terms)
  }
  if (view.notes) {
    heading('Notes')
    para(view.notes)
  }

  // a footer on every page
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    const y = doc.page.height - doc.page.margins.bottom + 20
    const keep = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    doc.font('regular').fontSize(8).fillColor(MUTED)
      .text(`${title} · ${firm.tradingName} · page ${i - range.start + 1} of ${range.count}`, left, y, { width, align: 'center', lineBreak: false })
    doc.page.margins.bottom = keep
  }
  doc.end()
  return done
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
  const pdf = await renderQuotePdf(view)
  const name = /^Q-\d+$/.test(view.reference) ? view.reference : 'quote'
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': pdf.length,
    'content-disposition': `attachment; filename="${name}.pdf"`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
    'content-security-policy': 'default-src \'none\'; sandbox',
  })
  return pdf
}
