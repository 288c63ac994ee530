// The price book's figures of issue 16: the rates for packing out a bead and making good a narrow
// return, the "ceilings before walls" rule, and the day's timeline (mixing, going off, the working
// day). Every bad figure is a 400 naming its field and saves nothing; only the owner changes them;
// a quote drafted from a measured visit prices the corner work from them. Figures are invented test
// rates; the defaults are the columns' (drizzle/0026_plan_picture_timeline.sql).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp
let owner: Client

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner } = await signUpFirm(app.url, 'Price Book Firm'))
})
afterAll(async () => {
  await app?.stop()
})

/** The book as the PUT takes it (without its firm and times). */
async function currentBook(who = owner) {
  const { firmId: _f, createdAt: _c, updatedAt: _u, ...rest } = (await who.get('/api/price-book')).body
  return rest as Record<string, unknown>
}

const NEW_FIGURES = ['packedBeadPerLmPence', 'narrowReturnPerLmPence', 'ceilingsFirst', 'quoteWorkPage', 'mixMinutes', 'goOffMinutes', 'dayStartMinutes', 'dayEndMinutes'] as const

describe('Rates and rules: the section once called the price book', () => {
  it('sends the old /price-book address to /rates', async () => {
    const res = await owner.get('/price-book')
    expect(res.status).toBe(301)
    expect(new URL(res.headers.get('location')!, app.url).pathname).toBe('/rates')
    expect((await owner.get('/rates')).status).toBe(200)
  })
})

describe('the price book: corner rates, ceilings first and the day\'s timeline', () => {
  it('a new firm starts with the defaults, and the owner\'s figures come back as saved', async () => {
    const fresh = (await signUpFirm(app.url, 'Fresh Book Firm')).client
    const start = await currentBook(fresh)
    // the columns' defaults: rates not set, ceilings first, 15 minutes to mix, 105 to go off, 08:00 to 16:30
    expect(Object.fromEntries(NEW_FIGURES.map(k => [k, start[k]]))).toEqual({
      packedBeadPerLmPence: 0, narrowReturnPerLmPence: 0, ceilingsFirst: true, quoteWorkPage: true, mixMinutes: 15, goOffMinutes: 105, dayStartMinutes: 480, dayEndMinutes: 990,
    })
    const figures = { packedBeadPerLmPence: 4_50, narrowReturnPerLmPence: 7_25, ceilingsFirst: false, quoteWorkPage: false, mixMinutes: 20, goOffMinutes: 90, dayStartMinutes: 450, dayEndMinutes: 1020 }
    const put = await fresh.put('/api/price-book', { ...start, ...figures })
    expect(put.status, JSON.stringify(put.body)).toBe(200)
    expect(put.body).toMatchObject(figures)
    expect(await currentBook(fresh)).toEqual({ ...start, ...figures })
  })

  it('a client that does not know the new figures leaves them as they are', async () => {
    const before = await currentBook()
    expect((await owner.put('/api/price-book', { ...before, goOffMinutes: 120, dayStartMinutes: 420, dayEndMinutes: 960 })).status).toBe(200)
    const old = Object.fromEntries(Object.entries(await currentBook()).filter(([k]) => !(NEW_FIGURES as readonly string[]).includes(k)))
    const put = await owner.put('/api/price-book', { ...old, skimWallsPerM2Pence: 19_00 })
    expect(put.status, JSON.stringify(put.body)).toBe(200)
    expect(await currentBook()).toMatchObject({ skimWallsPerM2Pence: 19_00, goOffMinutes: 120, dayStartMinutes: 420, dayEndMinutes: 960 })
  })

  it.each<[string, Record<string, unknown>, string, RegExp]>([
    ['a day that ends before it starts', { dayStartMinutes: 960, dayEndMinutes: 480 }, 'dayEndMinutes', /end after it starts/],
    ['a day that ends as it starts', { dayStartMinutes: 480, dayEndMinutes: 480 }, 'dayEndMinutes', /end after it starts/],
    ['an end with no start', { dayStartMinutes: undefined, dayEndMinutes: 990 }, 'dayStartMinutes', /starts as well/],
    ['a start with no end', { dayStartMinutes: 480, dayEndMinutes: undefined }, 'dayEndMinutes', /ends as well/],
    ['a start before midnight', { dayStartMinutes: -1 }, 'dayStartMinutes', /as a time/],
    ['an end past 23:59', { dayEndMinutes: 1440 }, 'dayEndMinutes', /as a time/],
    ['a start typed as a time, not minutes', { dayStartMinutes: '08:00' }, 'dayStartMinutes', /as a time/],
    ['a start in part-minutes', { dayStartMinutes: 480.5 }, 'dayStartMinutes', /as a time/],
    ['go-off under 20 minutes', { goOffMinutes: 19 }, 'goOffMinutes', /At least 20 minutes/],
    ['go-off over 6 hours', { goOffMinutes: 361 }, 'goOffMinutes', /360 minutes/],
    ['go-off as words', { goOffMinutes: 'about two hours' }, 'goOffMinutes', /whole minutes/],
    ['no time to mix', { mixMinutes: 0 }, 'mixMinutes', /At least 1 minute/],
    ['over two hours to mix', { mixMinutes: 121 }, 'mixMinutes', /120 minutes/],
    ['ceilings first as a word', { ceilingsFirst: 'yes' }, 'ceilingsFirst', /Tick the box/],
    ['the quote\'s work page as a number', { quoteWorkPage: 1 }, 'quoteWorkPage', /Tick the box/],
    ['a packed-out bead rate below nothing', { packedBeadPerLmPence: -1 }, 'packedBeadPerLmPence', /cannot be negative/],
    ['a packed-out bead rate in pounds with pence', { packedBeadPerLmPence: 4.5 }, 'packedBeadPerLmPence', /pounds and pence/],
    ['a narrow return rate far too high', { narrowReturnPerLmPence: 100_000_01 }, 'narrowReturnPerLmPence', /too high/],
    ['a narrow return rate as text', { narrowReturnPerLmPence: '7.00' }, 'narrowReturnPerLmPence', /pounds and pence/],
  ])('%s is a 400 naming the field, and nothing is saved', async (_what, change, field, message) => {
    const before = await currentBook()
    const res = await owner.put('/api/price-book', { ...before, ...change })
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(Object.keys(res.body.data.fields)).toEqual([field])
    expect(res.body.data.fields[field]).toMatch(message)
    expect(await currentBook()).toEqual(before)
  })

  it('only the owner changes them: the office and the crew are refused, signed out is a 401', async () => {
    const office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office')).client
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    const before = await currentBook()
    const change = { ...before, packedBeadPerLmPence: 99_00, ceilingsFirst: false, dayStartMinutes: 360, dayEndMinutes: 1200 }
    // the office reads the book (money:read) but may not change it (firm:manage)
    expect((await office.get('/api/price-book')).status).toBe(200)
    expect((await office.put('/api/price-book', change)).status).toBe(403)
    expect((await crew.put('/api/price-book', change)).status).toBe(403)
    const signedOut = new Client(app.url)
    expect((await signedOut.get('/api/price-book')).status).toBe(401)
    expect((await signedOut.put('/api/price-book', change)).status).toBe(401)
    expect(await currentBook()).toEqual(before)
  })
})

describe('the corner work on a quote drafted from a measured visit', () => {
  /** A visit with one room: a window wall with a packed-out bead to its reveal, and an 80 mm return to the next wall. */
  async function visitWithCorners() {
    const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Ines Carrow', email: uniqueEmail('cust') }, site: { line1: '9 Quarry Lane', postcode: 'OX9 4GH' } })).body
    const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-12-03T09:00:00Z' })).body
    const [w1, w2, rv] = [crypto.randomUUID(), crypto.randomUUID(), crypto.randomUUID()]
    const room = await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, {
      revision: 0,
      name: 'Box room',
      surfaces: [
        { id: w1, kind: 'wall', label: 'Window wall', lengthMm: 3000, secondMm: 2400 },
        { id: w2, kind: 'wall', label: 'Side wall', lengthMm: 2500, secondMm: 2400 },
        { id: rv, kind: 'reveal', label: 'Window reveal', lengthMm: 3400, secondMm: 200 },
      ],
      corners: [
        { id: crypto.randomUUID(), surfaceAId: w1, surfaceBId: rv, kind: 'external', lengthMm: 3400, needsBead: true, packedOut: true },
        { id: crypto.randomUUID(), surfaceAId: w1, surfaceBId: w2, kind: 'internal', lengthMm: 2400, returnWidthMm: 80 },
      ],
    })
    expect(room.status, JSON.stringify(room.body)).toBe(200)
    return { customerId: c.id, visitId: v.id }
  }
  async function draft() {
    const { customerId, visitId } = await visitWithCorners()
    const res = await owner.post('/api/quotes', { customerId, visitId })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    return (await owner.get(`/api/quotes/${res.body.id}`)).body.current
  }
  // corners come back by id (they have no position), so their lines are compared in a fixed order here
  const corner = (lines: any[]) => lines.filter(l => /^(Pack out beads|Make good narrow returns)/.test(l.description))
    .map(l => ({ description: l.description, quantityX1000: l.quantityX1000, unit: l.unit, unitPence: l.unitPence, derivation: l.derivation }))
    .sort((a, b) => b.description.localeCompare(a.description))

  it('prices the packed-out bead and the narrow return from the firm\'s rates, with their working', async () => {
    expect((await owner.put('/api/price-book', { ...(await currentBook()), packedBeadPerLmPence: 4_50, narrowReturnPerLmPence: 7_00, cornerTrowelMm: 100 })).status).toBe(200)
    const current = await draft()
    expect(corner(current.lines)).toEqual([
      // 3.40 m of bead packed out at £4.50 a metre
      { description: 'Pack out beads: Box room', quantityX1000: 3400, unit: 'm', unitPence: 4_50, derivation: 'Bead packed out along the 3.40 m corner between Window wall and Window reveal: 3.40 m' },
      // 2.40 m of corner made good at £7.00 a metre
      { description: 'Make good narrow returns: Box room', quantityX1000: 2400, unit: 'm', unitPence: 7_00, derivation: 'Return 80 mm wide (Window wall / Side wall), narrower than the 100 mm corner trowel: made good by hand along 2.40 m' },
    ])
    expect(current.rules.corners).toMatch(/narrower than 100 mm/)
  })

  it('with no rates set still lists the work, saying the rate is not in the price book', async () => {
    expect((await owner.put('/api/price-book', { ...(await currentBook()), packedBeadPerLmPence: 0, narrowReturnPerLmPence: 0 })).status).toBe(200)
    const lines = corner((await draft()).lines)
    expect(lines.map(l => [l.description, l.unitPence])).toEqual([['Pack out beads: Box room', 0], ['Make good narrow returns: Box room', 0]])
    expect(lines[0]!.derivation).toMatch(/No rate for packing out a bead is set in Rates and rules/)
    expect(lines[1]!.derivation).toMatch(/No rate for making good a narrow return is set in Rates and rules/)
  })

  it('reads the firm\'s corner trowel: with a 70 mm trowel the 80 mm return is not narrow', async () => {
    expect((await owner.put('/api/price-book', { ...(await currentBook()), packedBeadPerLmPence: 4_50, narrowReturnPerLmPence: 7_00, cornerTrowelMm: 70 })).status).toBe(200)
    const current = await draft()
    expect(corner(current.lines).map(l => l.description)).toEqual(['Pack out beads: Box room'])
    expect(current.rules.corners).toBeUndefined()
    expect((await owner.put('/api/price-book', { ...(await currentBook()), cornerTrowelMm: 100 })).status).toBe(200)
  })
})
