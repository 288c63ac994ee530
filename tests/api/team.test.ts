import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'
import { invitationToken, inviteAndJoin } from './support'

let app: TestApp

beforeAll(async () => {
  app = await startApp()
})
afterAll(async () => {
  await app?.stop()
})

describe('invitations', () => {
  it('sends an e-mail whose link opens, is accepted once, and signs the new person in with the role', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Fernhill Plaster')
    const email = uniqueEmail('crew')
    const sent = await owner.post('/api/team/invitations', { email, role: 'crew' })
    expect(sent.status).toBe(201)

    const mail = await app.waitForMail(email, /invited you/)
    expect(mail.subject).toContain('Fernhill Plaster')
    expect(mail.text).toContain(`${app.url}/invite/`)
    const token = await invitationToken(app, email)

    const opened = await new Client(app.url).get(`/api/invitations/${token}`)
    expect(opened.status).toBe(200)
    expect(opened.body).toMatchObject({ firmName: 'Fernhill Plaster', email, role: 'crew', hasAccount: false })

    const crew = new Client(app.url)
    const tooShort = await crew.post(`/api/invitations/${token}/accept`, { name: 'Cal Ridley', password: 'short' })
    expect(tooShort.status).toBe(400)
    expect(Object.keys(tooShort.body.data.fields)).toEqual(['password'])

    const accepted = await crew.post(`/api/invitations/${token}/accept`, { name: 'Cal Ridley', password: GOOD_PASSWORD })
    expect(accepted.status).toBe(200)
    const me = await crew.get('/api/me')
    expect(me.body).toMatchObject({ role: 'crew', user: { name: 'Cal Ridley', email }, firm: { tradingName: 'Fernhill Plaster' } })
    expect(me.body.permissions).not.toContain('money:read')

    // single use
    expect((await new Client(app.url).get(`/api/invitations/${token}`)).status).toBe(404)
    expect((await new Client(app.url).post(`/api/invitations/${token}/accept`, { name: 'Again', password: GOOD_PASSWORD })).status).toBe(404)

    const team = await owner.get('/api/team')
    expect(team.body.people.map((p: any) => [p.email, p.role])).toContainEqual([email, 'crew'])
    expect(team.body.invitations).toEqual([])
  })

  it('answers 404 for an unknown or malformed token, and for a withdrawn invitation', async () => {
    expect((await new Client(app.url).get(`/api/invitations/${'x'.repeat(43)}`)).status).toBe(404)
    expect((await new Client(app.url).get('/api/invitations/bad')).status).toBe(404)
    const { client: owner } = await signUpFirm(app.url)
    const email = uniqueEmail('withdrawn')
    const sent = await owner.post('/api/team/invitations', { email, role: 'office' })
    const token = await invitationToken(app, email)
    expect((await owner.delete(`/api/team/invitations/${sent.body.id}`)).status).toBe(204)
    expect((await new Client(app.url).get(`/api/invitations/${token}`)).status).toBe(404)
    expect((await owner.delete(`/api/team/invitations/${sent.body.id}`)).status).toBe(404)
  })

  it('answers 409 when the person is already in the firm', async () => {
    const { client: owner, email } = await signUpFirm(app.url)
    const res = await owner.post('/api/team/invitations', { email, role: 'office' })
    expect(res.status).toBe(409)
    expect(Object.keys(res.body.data.fields)).toEqual(['email'])
  })

  it('answers 400 naming the field for a bad e-mail or role', async () => {
    const { client: owner } = await signUpFirm(app.url)
    const res = await owner.post('/api/team/invitations', { email: 'not-an-address', role: 'boss' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields).sort()).toEqual(['email', 'role'])
  })

  it('lets someone with an account (an accountant) join a second firm and switch between them', async () => {
    const first = await signUpFirm(app.url, 'Alder Row Plastering')
    const { client: second } = await signUpFirm(app.url, 'Birchgate Render')
    await second.post('/api/team/invitations', { email: first.email, role: 'accountant' })
    const token = await invitationToken(app, first.email)
    expect((await new Client(app.url).get(`/api/invitations/${token}`)).body.hasAccount).toBe(true)

    const accountant = new Client(app.url)
    const wrong = await accountant.post(`/api/invitations/${token}/accept`, { password: 'not-the-password' })
    expect(wrong.status).toBe(400)
    expect((await accountant.post(`/api/invitations/${token}/accept`, { password: GOOD_PASSWORD })).status).toBe(200)

    const me = await accountant.get('/api/me')
    expect(me.body.role).toBe('accountant')
    expect(me.body.firm.tradingName).toBe('Birchgate Render')
    expect(me.body.firms.map((f: any) => f.tradingName)).toEqual(['Alder Row Plastering', 'Birchgate Render'])

    const alder = me.body.firms.find((f: any) => f.tradingName === 'Alder Row Plastering')
    expect((await accountant.put('/api/me/firm', { firmId: alder.id })).status).toBe(200)
    const after = await accountant.get('/api/me')
    expect(after.body).toMatchObject({ role: 'owner', firm: { tradingName: 'Alder Row Plastering' } })

    // a firm they do not belong to is not there
    const { firmId: strangers } = await signUpFirm(app.url, 'Stranger Walls')
    expect((await accountant.put('/api/me/firm', { firmId: strangers })).status).toBe(404)
    expect((await accountant.put('/api/me/firm', { firmId: 'nope' })).status).toBe(400)
  })
})

describe('roles', () => {
  it('refuses with 403 what a role may not do', async () => {
    const { client: owner } = await signUpFirm(app.url)
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    const office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office')).client
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')).client
    const firm = (await owner.get('/api/firm')).body
    const settings = { ...firm, vatNumber: firm.vatNumber ?? '', utr: firm.utr ?? '' }
    delete settings.id
    delete settings.createdAt
    delete settings.updatedAt

    const denied: [string, Client, () => Promise<{ status: number }>][] = [
      ['crew reads the team', crew, () => crew.get('/api/team')],
      ['crew invites', crew, () => crew.post('/api/team/invitations', { email: uniqueEmail('x'), role: 'crew' })],
      ['crew changes the firm', crew, () => crew.patch('/api/firm', settings)],
      ['crew reads the audit log', crew, () => crew.get('/api/audit')],
      ['office reads the team', office, () => office.get('/api/team')],
      ['office changes the firm', office, () => office.patch('/api/firm', settings)],
      ['accountant changes the firm', accountant, () => accountant.patch('/api/firm', settings)],
      ['accountant invites', accountant, () => accountant.post('/api/team/invitations', { email: uniqueEmail('x'), role: 'crew' })],
    ]
    for (const [what, , call] of denied) expect((await call()).status, what).toBe(403)

    // and what they may do; crew see the firm but never its money
    const crewView = await crew.get('/api/firm')
    expect(crewView.status).toBe(200)
    expect(crewView.body.tradingName).toBe(firm.tradingName)
    expect(crewView.body).not.toHaveProperty('dayRatePence')
    expect((await accountant.get('/api/firm')).body).toHaveProperty('dayRatePence')
    expect((await accountant.get('/api/audit')).status).toBe(200)
    expect((await owner.patch('/api/firm', settings)).status).toBe(200)
  })

  it('checks the role before reading the body: a crew member with bad input still gets 403', async () => {
    const { client: owner } = await signUpFirm(app.url)
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    expect((await crew.patch('/api/firm', { vatNumber: 'nonsense' })).status).toBe(403)
  })

  it('changes a role, keeps at least one owner (409), and a removed person is signed out on the next request', async () => {
    const { client: owner } = await signUpFirm(app.url)
    const email = uniqueEmail('crew')
    const crew = (await inviteAndJoin(app, owner, email, 'crew')).client
    const team = (await owner.get('/api/team')).body
    const me = team.people.find((p: any) => p.you)
    const them = team.people.find((p: any) => p.email === email)

    expect((await owner.patch(`/api/team/${me.id}`, { role: 'office' })).status).toBe(409)
    expect((await owner.delete(`/api/team/${me.id}`)).status).toBe(409)

    expect((await owner.patch(`/api/team/${them.id}`, { role: 'office' })).status).toBe(200)
    expect((await crew.get('/api/me')).body.role).toBe('office')

    expect((await owner.delete(`/api/team/${them.id}`)).status).toBe(204)
    expect((await crew.get('/api/me')).status).toBe(401)
    expect((await new Client(app.url).post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(401)

    const audit = (await owner.get('/api/audit')).body.map((a: any) => a.action)
    expect(audit).toEqual(expect.arrayContaining(['member.removed', 'member.role-changed', 'invitation.accepted', 'invitation.sent', 'firm.created']))
  })
})

describe('tenancy', () => {
  it('answers another firm\'s record exactly as a missing one: 404, same body', async () => {
    const a = await signUpFirm(app.url, 'Firm A')
    const b = await signUpFirm(app.url, 'Firm B')
    const aMember = (await a.client.get('/api/team')).body.people[0]
    const aInvite = (await a.client.post('/api/team/invitations', { email: uniqueEmail('a'), role: 'crew' })).body

    const cross = await b.client.patch(`/api/team/${aMember.id}`, { role: 'crew' })
    const missing = await b.client.patch(`/api/team/${randomUUID()}`, { role: 'crew' })
    expect(cross.status).toBe(404)
    expect(cross.body).toEqual({ ...missing.body, url: cross.body.url })

    expect((await b.client.delete(`/api/team/${aMember.id}`)).status).toBe(404)
    expect((await b.client.delete(`/api/team/invitations/${aInvite.id}`)).status).toBe(404)
    // and firm A is untouched
    const after = (await a.client.get('/api/team')).body
    expect(after.people[0]).toMatchObject({ id: aMember.id, role: 'owner' })
    expect(after.invitations.map((i: any) => i.id)).toEqual([aInvite.id])
    // B's lists hold nothing of A's
    const bTeam = (await b.client.get('/api/team')).body
    expect(bTeam.people.map((p: any) => p.email)).toEqual([b.email])
    expect((await b.client.get('/api/audit')).body.every((e: any) => e.entityId !== aMember.id)).toBe(true)
  })
})
