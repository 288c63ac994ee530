// Work set up through the API for the phone journeys: a measured room quoted, accepted by the
// customer and made a job booked for someone on a day; a site visit booked for someone. Invented
// customers and streets.
import { expect } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import type { TestApp } from '../support/app'

/** A customer's job of one box room (a patched outside wall, a landing wall, a ceiling), booked for `personName` today (London). */
export async function jobBookedToday(api: Client, app: TestApp, appUrl: string, personName: string, customer = 'Ingrid Tallow') {
  const email = uniqueEmail('ingrid')
  const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: customer, email }, site: { line1: '9 Coopers Yard', town: 'Kettlebury', postcode: 'KB6 1JT' } })).body
  const v = (await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: new Date(Date.now() - 86_400_000).toISOString() })).body
  const wallA = crypto.randomUUID()
  const wallB = crypto.randomUUID()
  const room = await api.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, {
    revision: 0,
    name: 'Box room',
    surfaces: [
      { id: wallA, kind: 'wall', label: 'Outside wall', lengthMm: 2600, secondMm: 2400, conditions: [{ id: crypto.randomUUID(), kind: 'patch-masonry', areaCm2: 3000 }] },
      { id: wallB, kind: 'wall', label: 'Landing wall', lengthMm: 2200, secondMm: 2400 },
      { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 2600, secondMm: 2200 },
    ],
    corners: [{ id: crypto.randomUUID(), surfaceAId: wallA, surfaceBId: wallB, kind: 'internal', lengthMm: 2400, returnWidthMm: 70 }],
  })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  const q = (await api.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })).body
  expect((await api.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
  const mail = await app.waitForMail(email, /Your quote [A-Z]+-Q[1-9]/)
  const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
  expect((await new Client(appUrl).post(`/api/public/quotes/${token}/accept`, { name: customer })).status).toBe(200)
  const job = (await api.post(`/api/quotes/${q.id}/job`)).body
  const members = (await api.get('/api/members')).body
  const person = members.find((m: any) => m.name === personName)
  const today = new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London' }).format(new Date())
  expect((await api.put(`/api/jobs/${job.id}/days`, { days: [{ day: today, userId: person.userId }] })).status).toBe(200)
  return { jobId: job.id as string, reference: job.reference as string, today }
}

/** A visit to a new customer's house, booked for `personName` later today (or tomorrow, late in the day). */
export async function visitBookedFor(api: Client, personName: string, customer = 'Tegan Ashdown') {
  const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: customer }, site: { line1: '22 Rookery Close', town: 'Kettlebury', postcode: 'KB5 1RT' } })).body
  const members = (await api.get('/api/members')).body
  const person = members.find((m: any) => m.name === personName)
  const v = await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: new Date(Date.now() + 2 * 3600_000).toISOString(), visitorUserId: person.userId })
  expect(v.status, JSON.stringify(v.body)).toBe(201)
  return { visitId: v.body.id as string }
}
