// The running total of a room's area while it is measured: each surface's area less its
// openings (every opening deducted; the quote applies the firm's small-voids rule later).
import type { SurfaceKind } from './ledger'
import { rectCm2 } from './measure'

export interface AreaSurface {
  kind: SurfaceKind
  lengthMm: number | null
  secondMm: number | null
  openings?: { widthMm: number | null, heightMm: number | null }[]
}

/** Net area of one surface in cm²: gross less openings, never below 0. Unfilled figures count as 0. */
export function surfaceNetCm2(s: AreaSurface): number {
  if (!s.lengthMm || !s.secondMm) return 0
  const gross = rectCm2(s.lengthMm, s.secondMm)
  const holes = (s.openings ?? []).reduce((sum, o) => sum + (o.widthMm && o.heightMm ? rectCm2(o.widthMm, o.heightMm) : 0), 0)
  return Math.max(0, gross - holes)
}

export interface RoomTotals {
  wallsCm2: number
  ceilingsCm2: number
  revealsAndStripsCm2: number
  totalCm2: number
}

/** Walls (with chimney breasts), ceilings, reveals and strips, and the total, in cm². */
export function roomTotals(surfaces: AreaSurface[]): RoomTotals {
  const t: RoomTotals = { wallsCm2: 0, ceilingsCm2: 0, revealsAndStripsCm2: 0, totalCm2: 0 }
  for (const s of surfaces) {
    const a = surfaceNetCm2(s)
    if (s.kind === 'ceiling') t.ceilingsCm2 += a
    else if (s.kind === 'reveal' || s.kind === 'strip') t.revealsAndStripsCm2 += a
    else t.wallsCm2 += a
    t.totalCm2 += a
  }
  return t
}
