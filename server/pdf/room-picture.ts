// The picture of a room's sets on a PDF page (the quote's "How we'll do the work"): the same
// layout as the phone's SVG (shared/utils/room-picture.ts), drawn with pdfkit at the page's
// width. Each set has its colour and its pattern (shared/utils/set-swatches.ts), so it reads
// printed in black and white; the number is written on every surface.
import type { RoomPicture } from '#shared/utils/room-picture'
import { NO_SET, setSwatch, type SetSwatch } from '#shared/utils/set-swatches'
import { INK, MUTED, type Pdf } from './document'

/** A set's pattern inside a box (pt), clipped to it. */
function pattern(doc: PDFKit.PDFDocument, x: number, y: number, w: number, h: number, s: SetSwatch, tile: number) {
  doc.save()
  doc.rect(x, y, w, h).fill(s.fill)
  doc.rect(x, y, w, h).clip()
  doc.lineWidth(tile * 0.14).strokeColor(s.ink).fillColor(s.ink)
  const p = s.pattern
  const span = w + h
  if (p === 'hatch' || p === 'cross') for (let d = 0; d <= span; d += tile) doc.moveTo(x + d, y).lineTo(x + d - h, y + h).stroke()
  if (p === 'backhatch' || p === 'cross') for (let d = -h; d <= w; d += tile) doc.moveTo(x + d, y).lineTo(x + d + h, y + h).stroke()
  if (p === 'rows' || p === 'grid') for (let d = tile / 2; d < h; d += tile) doc.moveTo(x, y + d).lineTo(x + w, y + d).stroke()
  if (p === 'columns' || p === 'grid') for (let d = tile / 2; d < w; d += tile) doc.moveTo(x + d, y).lineTo(x + d, y + h).stroke()
  if (p === 'dots') for (let i = tile / 2; i < w; i += tile) for (let j = tile / 2; j < h; j += tile) doc.circle(x + i, y + j, tile * 0.16).fill()
  if (p === 'zigzag') {
    for (let j = tile * 0.3; j < h; j += tile) {
      doc.moveTo(x, y + j + tile * 0.4)
      for (let i = 0; i < w; i += tile / 2) doc.lineTo(x + i + tile / 4, y + j + ((i / (tile / 2)) % 2 === 0 ? 0 : tile * 0.4))
      doc.stroke()
    }
  }
  doc.restore()
}

/** Draw one room's picture at the current y, as wide as the page allows; moves y below it. */
export function drawRoomPicture(pdf: Pdf, pic: RoomPicture) {
  const { doc, left, width } = pdf
  const k = width / pic.viewBox.w
  const height = pic.viewBox.h * k
  pdf.ensure(height + 24)
  doc.font('bold').fontSize(11).fillColor(INK).text(pic.name, left, doc.y, { width })
  const top = doc.y + 4
  const X = (mm: number) => left + (mm - pic.viewBox.x) * k
  const Y = (mm: number) => top + (mm - pic.viewBox.y) * k
  const S = (mm: number) => mm * k
  const tile = 6
  const text = (t: string, x: number, y: number, size: number, opts: { bold?: boolean, align?: 'middle' | 'start', color?: string } = {}) => {
    doc.font(opts.bold ? 'bold' : 'regular').fontSize(size).fillColor(opts.color ?? INK)
    const w = doc.widthOfString(t)
    doc.text(t, opts.align === 'start' ? x : x - w / 2, y - size * 0.8, { lineBreak: false })
  }
  for (const s of pic.surfaces) {
    const b = { x: X(s.box.x), y: Y(s.box.y), w: S(s.box.w), h: S(s.box.h) }
    const sw = s.setNumber === null ? NO_SET : setSwatch(s.setNumber)
    pattern(doc, b.x, b.y, b.w, b.h, sw, tile)
    doc.lineWidth(1).strokeColor(INK).rect(b.x, b.y, b.w, b.h).stroke()
    for (const o of s.openings) {
      doc.lineWidth(0.6).strokeColor(MUTED).fillColor('#FFFFFF')
      doc.rect(X(o.box.x), Y(o.box.y), S(o.box.w), S(o.box.h)).fillAndStroke('#FFFFFF', MUTED)
    }
    for (const m of s.marks) {
      const mb = { x: X(m.box.x), y: Y(m.box.y), w: S(m.box.w), h: S(m.box.h) }
      doc.lineWidth(0.6).roundedRect(mb.x, mb.y, mb.w, mb.h, 2).fillAndStroke('#FFFFFF', INK)
      const size = S(pic.unit * 10)
      text(m.label, mb.x + S(pic.unit * 15), mb.y + S(pic.unit * 11), size, { bold: true, align: 'start' })
      if (m.detail) text(m.detail, mb.x + S(pic.unit * 15), mb.y + S(pic.unit * 23), size, { align: 'start' })
      if (m.kind === 'patch') doc.lineWidth(0.6).strokeColor(INK).rect(mb.x + S(pic.unit * 3), mb.y + S(pic.unit * 3), S(pic.unit * 9), S(pic.unit * 9)).stroke()
      else if (m.kind === 'scrim') {
        const zx = mb.x + S(pic.unit * 3)
        const zy = mb.y + S(pic.unit * 3)
        const u = S(pic.unit)
        doc.lineWidth(0.8).strokeColor(INK).moveTo(zx, zy + 6 * u).lineTo(zx + 2.25 * u, zy + 2 * u).lineTo(zx + 4.5 * u, zy + 6 * u).lineTo(zx + 6.75 * u, zy + 2 * u).lineTo(zx + 9 * u, zy + 6 * u).stroke()
      }
    }
    if (s.number.outside) {
      const nb = { x: X(s.number.box.x), y: Y(s.number.box.y), w: S(s.number.box.w), h: S(s.number.box.h) }
      pattern(doc, nb.x, nb.y, nb.w, nb.h, sw, tile)
      doc.lineWidth(0.8).strokeColor(INK).rect(nb.x, nb.y, nb.w, nb.h).stroke()
      doc.moveTo(X(s.number.x), nb.y).lineTo(b.x + b.w / 2, b.y + b.h).stroke()
    }
    // the number on a white ground, so it reads over any pattern
    const size = S(s.number.outside ? pic.unit * 15 : s.number.size)
    doc.font('bold').fontSize(size)
    const nw = doc.widthOfString(s.number.text)
    doc.rect(X(s.number.x) - nw / 2 - 2, Y(s.number.y) - size * 0.45, nw + 4, size * 0.9).fill('#FFFFFF')
    text(s.number.text, X(s.number.x), Y(s.number.y) + size * 0.35, size, { bold: true })
    text(s.caption.text, X(s.caption.x), Y(s.caption.y), S(s.caption.size), { color: INK })
  }
  for (const c of pic.corners) {
    const ink = c.style === 'difficult' ? '#84301F' : c.style === 'plain' ? '#7D8C99' : INK
    doc.save().lineWidth(c.style === 'plain' ? 0.8 : 2.5).strokeColor(ink)
    if (c.style === 'difficult') doc.dash(4, { space: 2 })
    else if (c.style === 'packed') doc.dash(1.5, { space: 1.5 })
    for (const l of c.lines) doc.moveTo(X(l.x1), Y(l.y1)).lineTo(X(l.x2), Y(l.y2)).stroke()
    doc.undash().restore()
    if (c.tag) {
      doc.lineWidth(0.5).strokeColor(ink).moveTo(X(c.tag.leader.x1), Y(c.tag.leader.y1)).lineTo(X(c.tag.leader.x2), Y(c.tag.leader.y2)).stroke()
      text(c.tag.text, X(c.tag.x), Y(c.tag.y), S(c.tag.size), { bold: true, color: ink })
    }
  }
  doc.fillColor(INK)
  doc.x = left
  doc.y = top + height + 8
}
