import { expect } from 'vitest'
import type { TestApp } from '../support/app'
import { Client, GOOD_PASSWORD } from '../support/client'

/** The invitation link's token from the e-mail the server sent. */
export async function invitationToken(app: TestApp, email: string): Promise<string> {
  const mail = await app.waitForMail(email, /invited you/)
  const m = /\/invite\/([\w-]+)/.exec(mail.text ?? '')
  expect(m, `no invitation link in:\n${mail.text}`).not.toBeNull()
  return m![1]!
}

/** The owner invites `email` with `role`; the invitee accepts as a new person. Returns the invitee's client. */
export async function inviteAndJoin(app: TestApp, owner: Client, email: string, role: string, name = 'New Person') {
  const sent = await owner.post('/api/team/invitations', { email, role })
  expect(sent.status, JSON.stringify(sent.body)).toBe(201)
  const token = await invitationToken(app, email)
  const invitee = new Client(app.url)
  const accepted = await invitee.post(`/api/invitations/${token}/accept`, { name, password: GOOD_PASSWORD })
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
  return { client: invitee, token, invitationId: sent.body.id as string }
}
