import { describe, expect, it } from 'vitest'
import { can, isRole, PERMISSIONS, type Permission, type Role } from '../../shared/utils/roles'

// Source: Setwell's role rules (issue 2, section 3): owner does everything; office runs customers,
// quotes, invoices and payments but not firm settings or the team; crew sees assigned jobs and logs
// work, never prices or money; accountant reads money and downloads exports, changes nothing.
const table: [Role, Permission, boolean][] = [
  ['owner', 'firm:manage', true],
  ['owner', 'team:manage', true],
  ['owner', 'money:write', true],
  ['office', 'ledger:write', true],
  ['office', 'money:write', true],
  ['office', 'money:read', true],
  ['office', 'firm:manage', false],
  ['office', 'team:manage', false],
  ['crew', 'jobs:read-assigned', true],
  ['crew', 'work:log', true],
  ['crew', 'jobs:read-all', false],
  ['crew', 'money:read', false],
  ['crew', 'money:write', false],
  ['crew', 'ledger:write', false],
  ['accountant', 'money:read', true],
  ['accountant', 'customers:read', true],
  ['office', 'customers:read', true],
  ['crew', 'customers:read', false],
  ['accountant', 'exports:download', true],
  ['accountant', 'money:write', false],
  ['accountant', 'ledger:write', false],
  ['accountant', 'work:log', false],
  ['accountant', 'firm:manage', false],
]

describe('can', () => {
  it.each(table)('%s may %s: %s', (role, permission, expected) => {
    expect(can(role, permission)).toBe(expected)
  })

  it('grants the owner every permission there is', () => {
    expect(PERMISSIONS.filter(p => !can('owner', p))).toEqual([])
  })

  it('grants nothing without a role', () => {
    expect(PERMISSIONS.filter(p => can(null, p) || can(undefined, p))).toEqual([])
  })

  it('never lets crew or the accountant write money, the ledger or settings', () => {
    const writes: Permission[] = ['money:write', 'ledger:write', 'firm:manage', 'team:manage']
    for (const role of ['crew', 'accountant'] as const) expect(writes.filter(p => can(role, p))).toEqual([])
  })
})

describe('isRole', () => {
  it.each([
    ['owner', true], ['office', true], ['crew', true], ['accountant', true],
    ['admin', false], ['', false], [null, false], [3, false], ['Owner', false],
  ])('%s -> %s', (value, expected) => {
    expect(isRole(value)).toBe(expected)
  })
})
