// The pieces every Setwell PDF is drawn from (quotes, invoices, credit notes, claim letters):
// an A4 pdfkit document in the app's own fonts (server/pdf/fonts.ts, any Latin script through
// server/pdf/text.ts), the firm's heading with the document's particulars, the lines table, the
// totals with the VAT, reverse-charge and CIS wording, a footer on every page, and the download.
import { fullDate, isIsoDate } from '#shared/utils/dates'
import type { LineGroup } from '#shared/utils/line-groups'
import PDFDocument from 'pdfkit'
import type { H3Event } from 'h3'
import { formatPence } from '#shared/utils/money'
import { drawAnyLatin } from './text'

export const INK = '#1f2933'
export const MUTED = '#52606d'
export const RULE = '#cbd2d9'
export const GREEN = '#1d6b3a'
export const AMBER = '#7a4b00'

/** '2026-12-03' or a Date (its day in London) as 'Thursday 3 December 2026', as documents write dates. */
export function formatUkDate(value: Date | string | null | undefined): string {
  if (!value) return ''
  if (typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value)) return isIsoDate(value) ? fullDate(value) : String(value)
  const d = new Date(value)
  return Number.isNaN(d.getTime()) ? String(value) : fullDate(d)
}

export interface PdfFirm { tradingName: string, addressLine1: string, town: string, postcode: string, email: string, phone: string, vatNumber: string | null, vatRegistered: boolean }
export interface PdfTotals { vat: 'standard' | 'reverse-charge' | 'not-registered', cisRatePercent: number | null | undefined, totals: Record<string, number> }

/** A new document; `draw` fills it in; resolves to the PDF's bytes. */
export async function makePdf(meta: { title: string, subject: string }, draw: (p: Pdf) => void): Promise<Buffer> {
  const fonts = await import('./fonts')
  const regular = Buffer.from(fonts.regularWoff)
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: 50, bottom: 60, left: 50, right: 50 },
    bufferPages: true,
    // our font from the start, so pdfkit never loads its built-in Helvetica (no £ in it for us)
    font: regular as unknown as string,
    info: { Title: meta.title, Author: 'Setwell', Creator: 'Setwell', Producer: 'Setwell', Subject: meta.subject },
    lang: 'en-GB',
    displayTitle: true,
  } as PDFKit.PDFDocumentOptions)
  doc.registerFont('regular', regular)
  doc.registerFont('bold', Buffer.from(fonts.boldWoff))
  doc.registerFont('regular-ext', Buffer.from(fonts.regularExtWoff))
  doc.registerFont('bold-ext', Buffer.from(fonts.boldExtWoff))
  drawAnyLatin(doc)
  const chunks: Buffer[] = []
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  draw(new Pdf(doc))
  doc.end()
  return done
}

/** The drawing helpers, on one document. */
export class Pdf {
  readonly left: number
  readonly width: number
  constructor(readonly doc: PDFKit.PDFDocument) {
    this.left = doc.page.margins.left
    this.width = doc.page.width - doc.page.margins.left - doc.page.margins.right
  }

  bottom() {
    return this.doc.page.height - this.doc.page.margins.bottom
  }

  ensure(h: number) {
    if (this.doc.y + h > this.bottom()) this.doc.addPage()
  }

  heading(text: string) {
    this.ensure(40)
    this.doc.moveDown(0.8).font('bold').fontSize(12).fillColor(INK).text(text, this.left, this.doc.y, { width: this.width })
    this.doc.moveDown(0.2)
  }

  para(text: string, color = INK, size = 10) {
    if (!text) return
    const { doc } = this
    this.ensure(doc.font('regular').fontSize(size).heightOfString(text, { width: this.width }) + 4)
    doc.font('regular').fontSize(size).fillColor(color).text(text, this.left, doc.y, { width: this.width })
    doc.moveDown(0.3)
  }

  /** The firm on the left; the title, particulars and an optional stamp on the right. */
  firmHeading(firm: PdfFirm, title: string, particulars: string[], stamp: { text: string, color: string } | null) {
    const { doc, left, width } = this
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
    for (const p of particulars.filter(Boolean)) doc.text(p, rightX, doc.y, { width: rightW, align: 'right' })
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
  }

  /** Who the document is for, and where. */
  party(label: string, name: string, lines: string[]) {
    const { doc, left, width } = this
    doc.font('bold').fontSize(10).fillColor(MUTED).text(label, left, doc.y, { width })
    doc.font('bold').fontSize(12).fillColor(INK).text(name, left, doc.y, { width })
    for (const l of lines.filter(Boolean)) doc.font('regular').fontSize(10).fillColor(INK).text(l, left, doc.y, { width })
  }

  /**
   * The lines as the customer reads them (shared/utils/line-groups.ts groupLines: grouped by room
   * and kind of work, identical lines merged, labour first then materials); with the VAT rate of
   * each line when `vatColumn`.
   */
  linesTable(lines: readonly LineGroup[], vatColumn = false) {
    const { doc, left, width } = this
    const cols = vatColumn
      ? [
          { label: 'Description', w: width * 0.44, align: 'left' as const },
          { label: 'Quantity', w: width * 0.14, align: 'right' as const },
          { label: 'Unit price', w: width * 0.15, align: 'right' as const },
          { label: 'VAT', w: width * 0.1, align: 'right' as const },
          { label: 'Net', w: width * 0.17, align: 'right' as const },
        ]
      : [
          { label: 'Description', w: width * 0.52, align: 'left' as const },
          { label: 'Quantity', w: width * 0.16, align: 'right' as const },
          { label: 'Unit price', w: width * 0.15, align: 'right' as const },
          { label: 'Net', w: width * 0.17, align: 'right' as const },
        ]
    const row = (cells: string[], font: 'regular' | 'bold', color = INK) => {
      doc.font(font).fontSize(10)
      const h = Math.max(...cells.map((c, i) => doc.heightOfString(c, { width: cols[i]!.w - 6 }))) + 6
      if (doc.y + h > this.bottom()) {
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
    for (const l of lines) {
      const cells = [l.description, l.quantity, l.unitPrice]
      if (vatColumn) cells.push(`${l.vatRatePercent}%`)
      cells.push(formatPence(l.netPence))
      row(cells, 'regular')
    }
  }

  /** The totals, right-aligned, with the VAT treatment and CIS spelt out. */
  totals(v: PdfTotals, firmName: string, options: { totalLabel?: string } = {}) {
    const { doc, left, width } = this
    const t = v.totals
    const money = (k: string) => formatPence(t[k] ?? 0)
    doc.moveDown(0.6)
    const totalRow = (label: string, value: string, strong = false) => {
      this.ensure(18)
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
    if (v.vat === 'standard') totalRow('VAT', money('vatPence'))
    else if (v.vat === 'not-registered') totalRow('VAT (not VAT-registered: no VAT is charged)', money('vatPence'))
    else totalRow('VAT (reverse charge, not charged)', money('vatPence'))
    totalRow(options.totalLabel ?? 'Total', money('grossPence'), true)
    if (v.vat === 'reverse-charge') {
      doc.moveDown(0.3)
      this.para(`Reverse charge: customer to pay the VAT to HMRC. The VAT the customer accounts for is ${money('reverseChargeVatPence')}.`)
    }
    if (v.vat === 'not-registered') this.para(`${firmName} is not VAT-registered: no VAT is charged.`, MUTED)
    if (v.cisRatePercent !== null && v.cisRatePercent !== undefined) {
      doc.moveDown(0.3)
      if (v.cisRatePercent > 0) {
        this.para(`CIS: the contractor deducts ${v.cisRatePercent}% from the labour under the Construction Industry Scheme (${money('cisDeductionPence')}) and pays it to HMRC. Amount payable after the deduction: ${money('amountDuePence')}.`)
      }
      else this.para('CIS: paid gross under the Construction Industry Scheme, with no deduction.')
    }
  }

  /** "Title · Firm · page 1 of 2" on every page. */
  footer(title: string, firmName: string) {
    const { doc, left, width } = this
    const range = doc.bufferedPageRange()
    for (let i = range.start; i < range.start + range.count; i++) {
      doc.switchToPage(i)
      const y = doc.page.height - doc.page.margins.bottom + 20
      const keep = doc.page.margins.bottom
      doc.page.margins.bottom = 0
      doc.font('regular').fontSize(8).fillColor(MUTED)
        .text(`${title} · ${firmName} · page ${i - range.start + 1} of ${range.count}`, left, y, { width, align: 'center', lineBreak: false })
      doc.page.margins.bottom = keep
    }
  }
}

/** Answer with a PDF as a download. */
export function sendPdf(event: H3Event, pdf: Buffer, filename: string) {
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': pdf.length,
    'content-disposition': `attachment; filename="${filename}.pdf"`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
    'content-security-policy': 'default-src \'none\'; sandbox',
  })
  return pdf
}
