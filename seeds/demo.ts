// The demo scenario: invented firms in an invented town. No real people, firms or streets.
import type { Role } from '../shared/utils/roles'

export interface DemoPerson { key: string, name: string, email: string, password: string, role: Role }

export const DEMO_FIRM = {
  tradingName: 'Brackenridge Plastering',
  addressLine1: '14 Saltmarsh Row',
  addressLine2: '',
  town: 'Kettlebury',
  postcode: 'KB4 7QZ',
  email: 'office@brackenridge-plastering.example',
  phone: '01632 960 418',
  vatRegistered: true,
  vatNumber: 'GB999999973',
  cisStatus: 'registered' as const,
  utr: '1234567890',
  dayRatePence: 200_00,
  paymentTermsDays: 14,
  // the firm's own references: BP-J7 for a job, BP-12 for an invoice, BP-C3 for a credit note
  referenceLetters: 'BP',
  invoicePrefix: 'BP-',
  creditNotePrefix: 'BP-C',
  // an invented account (the sort code and number are plainly made up), so invoices offer transfer
  takesTransfer: true,
  bankAccountName: 'Brackenridge Plastering',
  bankSortCode: '123456',
  bankAccountNumber: '12345678',
}

export const DEMO_PEOPLE: DemoPerson[] = [
  { key: 'owner', name: 'Jess Marlow', email: 'jess@brackenridge-plastering.example', password: 'skim-coat-owner-26', role: 'owner' },
  { key: 'office', name: 'Sam Marlow', email: 'sam@brackenridge-plastering.example', password: 'office-ledger-26', role: 'office' },
  { key: 'crew', name: 'Kieran Dace', email: 'kieran@brackenridge-plastering.example', password: 'trowel-and-hawk-26', role: 'crew' },
  { key: 'accountant', name: 'Priya Venn', email: 'priya@venn-accounts.example', password: 'quarter-figures-26', role: 'accountant' },
]

/** A second invented firm the accountant also serves, so the firm switcher has something to switch to. */
export const SECOND_FIRM = {
  tradingName: 'Tollgate Skim & Render',
  addressLine1: '3 Furnace Yard',
  town: 'Kettlebury',
  postcode: 'KB2 9XD',
  dayRatePence: 180_00,
  referenceLetters: 'TSR',
  takesTransfer: true,
  bankAccountName: 'Tollgate Skim & Render',
  bankSortCode: '654321',
  bankAccountNumber: '87654321',
  owner: { name: 'Ruth Tollgate', email: 'ruth@tollgate-render.example', password: 'render-and-bead-26' },
}

/** Invented customers of the demo firm, with their sites (streets and people made up). */
export const DEMO_CUSTOMERS = [
  { key: 'colley', kind: 'homeowner' as const, name: 'Harriet Colley', email: 'harriet.colley@example.invalid', phone: '07700 900318', billingLine1: '3 Wren Close', billingTown: 'Kettlebury', billingPostcode: 'KB2 3LP', sites: [{ line1: '3 Wren Close', town: 'Kettlebury', postcode: 'KB2 3LP' }] },
  { key: 'millbeck', kind: 'landlord' as const, name: 'Millbeck Lettings', contactName: 'Owen Sallis', email: 'owen@millbeck-lettings.example', phone: '01632 960 233', billingLine1: '40 Corn Exchange', billingTown: 'Kettlebury', billingPostcode: 'KB1 1AX', endUserNotified: true, sites: [{ label: 'Flat 2', line1: 'Flat 2, 18 Tanner Street', town: 'Kettlebury', postcode: 'KB1 4DN' }, { label: 'Flat 5', line1: 'Flat 5, 18 Tanner Street', town: 'Kettlebury', postcode: 'KB1 4DN' }] },
  { key: 'pribbleworth', kind: 'builder' as const, name: 'Pribbleworth Scarnholme Builds Ltd', contactName: 'Priti Hale', email: 'accounts@pribbleworth-scarnholme.example', phone: '01632 960 580', billingLine1: 'Unit 7, Lime Kiln Yard', billingTown: 'Kettlebury', billingPostcode: 'KB5 8RT', vatRegistered: true, vatNumber: 'GB999999875', paysUnderCis: true, cisRatePercent: 20 as const, sites: [{ label: 'Barn conversion', line1: 'Hollow Barn, Sheepwash Lane', town: 'Upper Kettlebury', postcode: 'KB7 2WW' }] },
  { key: 'orchard', kind: 'business' as const, name: 'Orchard Row Café', contactName: 'Bea Marsh', email: 'hello@orchardrow.example', phone: '01632 960 902', billingLine1: '12 Orchard Row', billingTown: 'Kettlebury', billingPostcode: 'KB3 6FE', sites: [{ line1: '12 Orchard Row', town: 'Kettlebury', postcode: 'KB3 6FE' }] },
]

export const DEMO_ENQUIRIES = [
  { customer: 'colley', site: 0, source: 'phone' as const, description: 'Back bedroom ceiling cracked after a leak; walls need a skim before decorating.', preferredDates: 'Before Christmas if possible', status: 'visit-booked' as const },
  { customer: 'millbeck', site: 0, source: 'repeat' as const, description: 'Flat 2 between tenants: patch and skim the living room and hall.', preferredDates: 'Empty until 15 January', status: 'new' as const },
  { customer: 'pribbleworth', site: 0, source: 'referral' as const, description: 'Barn conversion: board and skim two floors, reveals to eight windows.', preferredDates: 'February', status: 'quoted' as const },
  { customer: 'orchard', site: 0, source: 'web-form' as const, description: 'Patch the wall behind the counter where the old tiles came off.', preferredDates: '', status: 'lost' as const, lostReason: 'Did the work themselves' },
]

/** The demo firm's rates (demo figures, in the range DOMAIN.md gives for demo data only). */
export const DEMO_PRICE_BOOK = {
  skimWallsPerM2Pence: 18_00,
  skimCeilingsPerM2Pence: 21_00,
  undercoatPerM2Pence: 14_00,
  revealsPerLmPence: 9_00,
  beadsPerLmPence: 6_00,
  scrimPerLmPence: 2_00,
  /** Packing out a bead (on top of fitting it) and making good a return too narrow for the corner trowel, per metre (invented demo rates). */
  packedBeadPerLmPence: 4_50,
  narrowReturnPerLmPence: 7_00,
  materialsMarkupPercent: 15,
  minDeductCm2: 5000,
  m2PerDay: 30,
  /** Generic making good priced by the item (invented demo prices). */
  makingGoodItems: [
    { name: 'Make good round a socket or switch', unit: 'item', pricePence: 12_00 },
    { name: 'Make good round a new pipe or cable run', unit: 'metre', pricePence: 8_00 },
    { name: 'Patch a hole up to a hand\'s width', unit: 'item', pricePence: 25_00 },
  ],
}
