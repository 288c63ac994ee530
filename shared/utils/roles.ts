// Who may do what. The server checks these on every route (server/utils/auth.ts); the shell
// uses the same table to show only what a role may use. Pure: no Vue, no Nitro.

export const ROLES = ['owner', 'office', 'crew', 'accountant'] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  office: 'Office',
  crew: 'Crew',
  accountant: 'Accountant',
}

export const ROLE_SUMMARIES: Record<Role, string> = {
  owner: 'Everything, including firm settings and the team.',
  office: 'Customers, quotes, invoices and payments. Not firm settings or the team.',
  crew: 'The jobs they are put on: logs work and photos. Never sees prices or money.',
  accountant: 'Reads the money and downloads exports. Changes nothing.',
}

/**
 * Permissions, named by what they let a person do. Adding a feature means adding a permission
 * here and granting it below, so the server check and the menu stay one decision.
 */
export const PERMISSIONS = [
  'firm:read', // see the firm's name and address
  'firm:manage', // change firm settings
  'team:manage', // invite, change roles, remove people
  'customers:read', // customers and their billing details (read only)
  'ledger:write', // customers, enquiries, visits, quotes
  'jobs:read-all', // every job in the firm
  'jobs:read-assigned', // the jobs a person is put on
  'work:log', // log sets, materials used, photos
  'money:read', // prices, invoices, payments, profit
  'money:write', // raise invoices, record payments, chase
  'exports:download', // CSV for the accountant
  'audit:read', // who changed what
] as const
export type Permission = (typeof PERMISSIONS)[number]

const GRANTS: Record<Role, readonly Permission[]> = {
  owner: PERMISSIONS,
  office: ['firm:read', 'customers:read', 'ledger:write', 'jobs:read-all', 'jobs:read-assigned', 'work:log', 'money:read', 'money:write', 'exports:download'],
  crew: ['firm:read', 'jobs:read-assigned', 'work:log'],
  accountant: ['firm:read', 'customers:read', 'money:read', 'exports:download', 'audit:read'],
}

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false
  return GRANTS[role].includes(permission)
}

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value)
}
