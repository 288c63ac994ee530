// Journey 2: the owner invites a crew member; the invitee opens the e-mailed link in a browser
// of their own, joins, and sees the crew's Today and the crew's shorter menu. The owner then
// finds them in the team.
import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import {
  expectAbsent, expectCleanRun, expectPath, expectText, expectVisible, menuLabels, reload,
  screenshot, signInToDashboard, textOf, useE2E, visit,
} from './browser'
import { FIRM_NAME, OWNER } from './demo'

const e2e = useE2E()

describe('inviting a crew member', () => {
  it('the invitee joins from the e-mailed link and gets the crew view; the owner sees them in the team', async () => {
    const suffix = randomUUID().slice(0, 8)
    const email = `tamsin-hollybrook-${suffix}@test.example`
    const name = 'Tamsin Hollybrook'
    const password = 'hawk-and-trowel-77'

    // the owner sends the invitation from Settings, Team
    const jess = await e2e.open()
    const owner = jess.page
    await signInToDashboard(owner, e2e.url, OWNER.email, OWNER.password)
    // on the phone, Settings is under More
    await owner.getByTestId('nav-more').click()
    await owner.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Settings' }).click()
    await expectPath(owner, '/settings')
    await owner.getByRole('main').getByRole('link', { name: 'Team' }).click()
    await expectPath(owner, '/team')
    const form = owner.getByTestId('invite-form')
    await expectVisible(form)
    await form.getByLabel('Their e-mail').fill(email)
    const crew = form.getByRole('group', { name: 'Role' }).getByRole('radio', { name: /^Crew/ })
    await crew.check()
    expect(await crew.isChecked()).toBe(true)
    expect(await form.getByRole('radio').count()).toBe(4)
    await form.getByRole('button', { name: 'Send invitation' }).click()

    await expectText(owner.getByRole('status').filter({ hasText: 'Invitation sent' }), `Invitation sent to ${email}.`)
    const pending = owner.getByTestId('pending-invitation').filter({ hasText: email })
    await expectText(pending, /Crew · link works until/)
    expect(await form.getByLabel('Their e-mail').inputValue()).toBe('')

    // the e-mail carries a single link to this app
    const mail = await e2e.app.waitForMail(email, new RegExp(`invited you to ${FIRM_NAME}`))
    expect(mail.text).toContain('as crew')
    const links = [...(mail.text ?? '').matchAll(/https?:\/\/\S+\/invite\/[\w-]+/g)].map(m => m[0])
    expect(links).toHaveLength(1)
    const link = links[0]!
    expect(link.startsWith(`${e2e.url}/invite/`)).toBe(true)

    // the invitee, in a browser of their own
    const tamsin = await e2e.open()
    const invitee = tamsin.page
    await visit(invitee, link)
    await expectText(invitee.getByRole('heading', { level: 1 }), `Join ${FIRM_NAME}`)
    await expectText(invitee.getByText('Joining as'), email)
    await expectText(invitee.getByText('You have been invited as'), 'Crew')
    await screenshot(invitee, 'invitation-page')

    await invitee.getByLabel('Your name').fill(name)
    await invitee.getByLabel('Choose a password').fill(password)
    await invitee.getByRole('button', { name: `Join ${FIRM_NAME}` }).click()

    await expectPath(invitee, '/')
    await expectText(invitee.getByTestId('dashboard-heading'), 'Hello, Tamsin')
    await expectVisible(invitee.getByTestId('dashboard-crew'))
    await expectText(invitee.getByTestId('dashboard-crew'), 'Your work today')
    expect(await invitee.getByTestId('dashboard-owner').count()).toBe(0)
    await expectText(invitee.getByText(`${FIRM_NAME} · Crew`), 'Crew')

    // the crew's menu: Today, their visits and Settings; no enquiries or customers
    expect(await menuLabels(invitee)).toEqual(['Today', 'Visits', 'Jobs', 'Settings'])
    const nav = invitee.getByRole('navigation', { name: 'Sections' })
    await expectVisible(nav.getByRole('link', { name: 'Today' }))
    expect(await nav.getByRole('link', { name: 'Customers' }).count()).toBe(0)
    expect(await nav.getByRole('link', { name: 'Enquiries' }).count()).toBe(0)
    await screenshot(invitee, 'crew-dashboard')
    // and Settings holds only their own account: no Team, no Firm
    await nav.getByRole('link', { name: 'Settings' }).click()
    await expectPath(invitee, '/settings')
    const settings = invitee.getByRole('main')
    await expectVisible(settings.getByRole('link', { name: 'Your account' }))
    expect(await settings.getByRole('link', { name: 'Team' }).count()).toBe(0)
    expect(await settings.getByRole('link', { name: 'Firm' }).count()).toBe(0)

    // typing the address of Team does not get crew in either
    await visit(invitee, `${e2e.url}/team`)
    await expectPath(invitee, '/')
    await expectAbsent(invitee.getByTestId('invite-form'))

    // the link worked once
    await visit(invitee, link)
    await expectText(invitee.getByRole('heading', { level: 1 }), 'This link no longer works')
    expect(await invitee.getByRole('button', { name: `Join ${FIRM_NAME}` }).count()).toBe(0)

    // back with the owner: the new person is in the team, the invitation is no longer waiting
    await reload(owner)
    await expectPath(owner, '/team')
    const member = owner.getByTestId('member').filter({ hasText: email })
    await expectText(member, name)
    expect(await member.getByRole('combobox', { name: `Role of ${name}` }).inputValue()).toBe('crew')
    expect(await owner.getByTestId('pending-invitation').filter({ hasText: email }).count()).toBe(0)
    expect(await textOf(owner.getByTestId('member').filter({ hasText: OWNER.email }))).toContain('(you)')
    await screenshot(owner, 'owner-team-after-join')

    // removing someone asks first, in a dialog: going back keeps them
    await member.getByRole('button', { name: 'Remove' }).click()
    const ask = owner.getByRole('alertdialog')
    await expectText(ask, `Remove ${name} from the firm?`)
    await expectText(ask, 'They are signed out at once')
    await screenshot(owner, 'owner-team-remove-asks')
    await ask.getByRole('button', { name: 'Go back' }).click()
    await expectAbsent(ask)
    await expectText(member, name)
    // going ahead removes them, and their next page takes them to sign in
    await member.getByRole('button', { name: 'Remove' }).click()
    await ask.getByRole('button', { name: `Remove ${name}` }).click()
    await expectText(owner.getByRole('status').filter({ hasText: 'was removed' }), `${name} was removed.`)
    await expectAbsent(owner.getByTestId('member').filter({ hasText: email }))
    await visit(invitee, `${e2e.url}/`)
    await expectPath(invitee, '/sign-in')

    expectCleanRun(jess)
    expectCleanRun(tamsin)
  })
})
