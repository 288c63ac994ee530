// The phone's bottom bar: at most five places, the last one "More" when the role's sections do not
// all fit (common practice for a phone's tab bar: five is the most that stay readable at 390 px).
import { describe, expect, it } from 'vitest'
import { NAV_ITEMS, PHONE_BAR_MAX, navAllows, phoneBar } from '../../app/utils/nav'
import { can, type Role } from '#shared/utils/roles'

const labels = (items: { label: string }[]) => items.map(i => i.label)
const forRole = (role: Role) => phoneBar(NAV_ITEMS.filter(i => navAllows(i, p => can(role, p))))

describe('phoneBar', () => {
  it.each([
    // role, in the bar, under More (worked out by hand from NAV_ITEMS and the roles' permissions)
    ['owner', ['Today', 'Visits', 'Jobs', 'Money'], ['Enquiries', 'Customers', 'Settings']],
    ['office', ['Today', 'Visits', 'Jobs', 'Money'], ['Enquiries', 'Customers', 'Settings']],
    ['crew', ['Today', 'Visits', 'Jobs', 'Settings'], []],
    ['accountant', ['Today', 'Customers', 'Money', 'Settings'], []],
  ] as const)('%s: bar %j, More %j', (role, bar, more) => {
    const split = forRole(role)
    expect(labels(split.bar)).toEqual(bar)
    expect(labels(split.more)).toEqual(more)
  })

  it.each([1, 4, 5, 6, 7])('%i sections: never more than five places, nothing lost, nothing twice', (n) => {
    const items = NAV_ITEMS.slice(0, n)
    const split = phoneBar(items)
    const places = split.bar.length + (split.more.length ? 1 : 0)
    expect(places).toBeLessThanOrEqual(PHONE_BAR_MAX)
    expect([...split.bar, ...split.more].map(i => i.to).sort()).toEqual(items.map(i => i.to).sort())
    // when they fit, no More
    if (n <= PHONE_BAR_MAX) expect(split.more).toEqual([])
  })
})
