import type { Permission } from '#shared/utils/roles'

export type NavIcon = 'today' | 'jobs' | 'enquiries' | 'visits' | 'customers' | 'quotes' | 'team' | 'firm' | 'account' | 'settings' | 'more'
export interface NavItem { to: string, label: string, icon: NavIcon, permission?: Permission, anyOf?: Permission[] }

/** The sections of the shell. Each shows only to roles with its permission (the server checks again). */
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Today', icon: 'today' },
  { to: '/enquiries', label: 'Enquiries', icon: 'enquiries', permission: 'ledger:write' },
  { to: '/visits', label: 'Visits', icon: 'visits', anyOf: ['ledger:write', 'jobs:read-assigned'] },
  { to: '/customers', label: 'Customers', icon: 'customers', permission: 'customers:read' },
  { to: '/jobs', label: 'Jobs', icon: 'jobs', permission: 'jobs:read-assigned' },
  { to: '/money', label: 'Money', icon: 'quotes', permission: 'money:read' },
  { to: '/settings', label: 'Settings', icon: 'settings' },
]

/** What Money holds: the pages under it light up its item in the bar. */
export const MONEY_ITEMS: NavItem[] = [
  { to: '/quotes', label: 'Quotes', icon: 'quotes', permission: 'money:read' },
  { to: '/invoices', label: 'Invoices', icon: 'quotes', permission: 'money:read' },
  { to: '/owed', label: 'What is owed', icon: 'quotes', permission: 'money:read' },
  { to: '/bank', label: 'Bank statement', icon: 'quotes', permission: 'money:read' },
  { to: '/chasing', label: 'Chasing payment', icon: 'quotes', permission: 'money:read' },
  { to: '/purchases', label: 'Purchases and receipts', icon: 'quotes', permission: 'money:read' },
  { to: '/quarter', label: 'The quarter: VAT and exports', icon: 'quotes', permission: 'money:read' },
  { to: '/cis', label: 'CIS deducted', icon: 'quotes', permission: 'money:read' },
  { to: '/profit', label: 'Is the work paying?', icon: 'quotes', permission: 'money:read' },
]

/** What Settings holds, by permission. */
export const SETTINGS_ITEMS: NavItem[] = [
  { to: '/firm', label: 'Firm', icon: 'firm', permission: 'firm:manage' },
  { to: '/rates', label: 'Rates and rules', icon: 'quotes', permission: 'money:read' },
  { to: '/materials', label: 'Materials', icon: 'quotes', permission: 'money:read' },
  { to: '/team', label: 'Team', icon: 'team', permission: 'team:manage' },
  { to: '/account', label: 'Your account', icon: 'account' },
]

export function navAllows(item: NavItem, allows: (p: Permission) => boolean) {
  if (item.permission && !allows(item.permission)) return false
  if (item.anyOf && !item.anyOf.some(allows)) return false
  return true
}

/** The most destinations a phone's bottom bar holds; past that, the last place is "More". */
export const PHONE_BAR_MAX = 5

/**
 * Which sections go in the phone's bar first when they do not all fit: the day, the work on site,
 * the visits to measure, then the money. The rest (enquiries are answered from Today) go under More.
 */
const PHONE_FIRST = ['/', '/jobs', '/visits', '/money', '/enquiries', '/customers', '/settings']

/**
 * The phone's bottom bar for the sections a person may use: all of them when they fit in
 * PHONE_BAR_MAX places, otherwise the first PHONE_BAR_MAX - 1 by PHONE_FIRST and a "More" sheet
 * holding the rest in the menu's own order.
 */
export function phoneBar(items: NavItem[]): { bar: NavItem[], more: NavItem[] } {
  if (items.length <= PHONE_BAR_MAX) return { bar: items, more: [] }
  const rank = (i: NavItem) => {
    const at = PHONE_FIRST.indexOf(i.to)
    return at === -1 ? PHONE_FIRST.length : at
  }
  const chosen = new Set([...items].sort((a, b) => rank(a) - rank(b)).slice(0, PHONE_BAR_MAX - 1))
  return { bar: items.filter(i => chosen.has(i)), more: items.filter(i => !chosen.has(i)) }
}
