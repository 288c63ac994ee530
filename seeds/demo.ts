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
  invoicePrefix: 'BRP-',
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
  owner: { name: 'Ruth Tollgate', email: 'ruth@tollgate-render.example', password: 'render-and-bead-26' },
}
