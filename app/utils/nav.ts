import type { Permission } from '#shared/utils/roles'

export interface NavItem { to: string, label: string, icon: 'today' | 'team' | 'firm' | 'account', permission?: Permission }

/** The sections of the shell. Each shows only to roles with its permission (the server checks again). */
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Today', icon: 'today' },
  { to: '/team', label: 'Team', icon: 'team', permission: 'team:manage' },
  { to: '/firm', label: 'Firm', icon: 'firm', permission: 'firm:manage' },
  { to: '/account', label: 'Account', icon: 'account' },
]
