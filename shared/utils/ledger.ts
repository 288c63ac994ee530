// The words of the ledger: kinds, sources, statuses, with the labels people read.
// Pure lists shared by the schema, the zod schemas and the pages.

export const CUSTOMER_KINDS = ['homeowner', 'landlord', 'builder', 'business'] as const
export type CustomerKind = (typeof CUSTOMER_KINDS)[number]
export const CUSTOMER_KIND_LABELS: Record<CustomerKind, string> = {
  homeowner: 'Homeowner',
  landlord: 'Landlord or letting agent',
  builder: 'Builder or contractor',
  business: 'Other business',
}

export const ENQUIRY_SOURCES = ['phone', 'message', 'web-form', 'referral', 'repeat'] as const
export type EnquirySource = (typeof ENQUIRY_SOURCES)[number]
export const ENQUIRY_SOURCE_LABELS: Record<EnquirySource, string> = {
  'phone': 'Phone call',
  'message': 'Message',
  'web-form': 'Web form',
  'referral': 'Referral',
  'repeat': 'Repeat customer',
}

export const ENQUIRY_STATUSES = ['new', 'visit-booked', 'quoted', 'won', 'lost'] as const
export type EnquiryStatus = (typeof ENQUIRY_STATUSES)[number]
export const ENQUIRY_STATUS_LABELS: Record<EnquiryStatus, string> = {
  'new': 'New',
  'visit-booked': 'Visit booked',
  'quoted': 'Quoted',
  'won': 'Won',
  'lost': 'Lost',
}

/** Where an enquiry may move next. Lost and won are ends, but a lost enquiry can be reopened. */
export const ENQUIRY_MOVES: Record<EnquiryStatus, readonly EnquiryStatus[]> = {
  'new': ['visit-booked', 'quoted', 'lost'],
  'visit-booked': ['quoted', 'lost', 'new'],
  'quoted': ['won', 'lost', 'visit-booked'],
  'won': [],
  'lost': ['new'],
}

export function canMoveEnquiry(from: EnquiryStatus, to: EnquiryStatus): boolean {
  return ENQUIRY_MOVES[from].includes(to)
}

export const VISIT_STATUSES = ['booked', 'done', 'cancelled'] as const
export type VisitStatus = (typeof VISIT_STATUSES)[number]
/** A visit's status in words, as people read it (never the code). */
export const VISIT_STATUS_LABELS: Record<VisitStatus, string> = {
  booked: 'Booked',
  done: 'Done',
  cancelled: 'Cancelled',
}

export const SURFACE_KINDS = ['wall', 'ceiling', 'chimney-breast', 'reveal', 'strip'] as const
export type SurfaceKind = (typeof SURFACE_KINDS)[number]
export const SURFACE_KIND_LABELS: Record<SurfaceKind, string> = {
  'wall': 'Wall',
  'ceiling': 'Ceiling',
  'chimney-breast': 'Chimney breast',
  'reveal': 'Reveal',
  'strip': 'Narrow strip',
}
/** What the second dimension of each kind of surface is called. */
export const SURFACE_SECOND_LABELS: Record<SurfaceKind, string> = {
  'wall': 'Height',
  'ceiling': 'Width',
  'chimney-breast': 'Height',
  'reveal': 'Depth',
  'strip': 'Width',
}

export const BACKGROUNDS = ['sound-plaster', 'paper-stripped', 'plasterboard', 'undercoat', 'masonry', 'other'] as const
export type Background = (typeof BACKGROUNDS)[number]
export const BACKGROUND_LABELS: Record<Background, string> = {
  'sound-plaster': 'Sound old plaster',
  'paper-stripped': 'Paper stripped',
  'plasterboard': 'Plasterboard',
  'undercoat': 'Back to the undercoat',
  'masonry': 'Back to masonry',
  'other': 'Other',
}

export const OPENING_KINDS = ['door', 'window', 'void'] as const
export type OpeningKind = (typeof OPENING_KINDS)[number]
export const OPENING_KIND_LABELS: Record<OpeningKind, string> = { door: 'Door', window: 'Window', void: 'Other void' }

export const CONDITION_KINDS = ['patch-undercoat', 'patch-masonry', 'crack', 'frame-gap', 'out-of-true', 'damaged-corner', 'textured-coating'] as const
export type ConditionKind = (typeof CONDITION_KINDS)[number]
export const CONDITION_KIND_LABELS: Record<ConditionKind, string> = {
  'patch-undercoat': 'Patch back to the undercoat',
  'patch-masonry': 'Patch back to masonry',
  'crack': 'Crack',
  'frame-gap': 'Gap around a frame',
  'out-of-true': 'Out of true',
  'damaged-corner': 'Damaged corner',
  'textured-coating': 'Textured coating',
}

export const CORNER_KINDS = ['internal', 'external'] as const
export type CornerKind = (typeof CORNER_KINDS)[number]

/** Shown wherever a textured coating is recorded. */
export const ASBESTOS_CAUTION = 'Old textured coatings can contain asbestos. Have a sample tested by an accredited surveyor or laboratory before it is sanded, scraped or drilled, and follow their advice; licensable asbestos is removed only by a licensed contractor (HSE guidance).'

/** What can name a customer or a site, in the order a removal that is refused lists it. */
export const HOLDING_WORK = ['invoices', 'creditNotes', 'jobs', 'quotes', 'visits', 'enquiries', 'cisStatements'] as const
export type HoldingWork = (typeof HOLDING_WORK)[number]
const HOLDING_WORDS: Record<HoldingWork, [string, string]> = {
  invoices: ['invoice', 'invoices'],
  creditNotes: ['credit note', 'credit notes'],
  jobs: ['job', 'jobs'],
  quotes: ['quote', 'quotes'],
  visits: ['visit', 'visits'],
  enquiries: ['enquiry', 'enquiries'],
  cisStatements: ['CIS statement', 'CIS statements'],
}

/** Counts of work in words: { invoices: 2, jobs: 1 } -> "2 invoices and 1 job"; '' when there is none. */
export function holdingWorkInWords(counts: Partial<Record<HoldingWork, number>>): string {
  const parts = HOLDING_WORK.filter(k => (counts[k] ?? 0) > 0).map((k) => {
    const n = counts[k]!
    return `${n} ${HOLDING_WORDS[k][n === 1 ? 0 : 1]}`
  })
  if (parts.length <= 1) return parts.join('')
  return `${parts.slice(0, -1).join(', ')} and ${parts.at(-1)}`
}
