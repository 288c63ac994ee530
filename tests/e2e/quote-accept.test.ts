// From the measured demo visit to an accepted quote: the owner makes the quote from the
// measurements, sends it; the customer opens the e-mailed link on their own phone and accepts;
// the firm sees it accepted.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

describe('quoting from a measured visit', () => {
  it('builds a quote priced by measure, sends it, and the customer accepts it from the e-mail', async () => {
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const visits = (await api.get('/api/visits?from=2000-01-01T00:00:00Z&show=finished')).body
    const measured = visits.find((v: any) => v.customer.name === 'Harriet Colley' && v.status === 'done')
    expect(measured, 'the seeded measured visit').toBeDefined()

    const jess = await e2e.open()
    const owner = jess.page
    await signInToDashboard(owner, e2e.url, OWNER.email, OWNER.password)
    await visit(owner, `${e2e.url}/visits/${measured.id}`)
    await owner.getByTestId('make-quote').click()
    await owner.waitForURL(u => /^\/quotes\/[0-9a-f-]{36}$/.test(u.pathname))
    const quoteId = new URL(owner.url()).pathname.split('/').pop()!
    // the lines are the take-off, each with its working shown
    await expectVisible(owner.getByTestId('quote-line').first())
    const descriptions = await owner.getByTestId('quote-line').locator('input[aria-label$="description"]').evaluateAll(els => els.map(e => (e as HTMLInputElement).value))
    expect(descriptions.some(d => d.startsWith('Skim walls'))).toBe(true)
    await expectVisible(owner.getByText(/How: .* = \d+\.\d\d m²/).first())
    const draft = (await api.get(`/api/quotes/${quoteId}`)).body
    expect(draft.current.pricing).toBe('measure')
    expect(draft.current.lines.length).toBeGreaterThan(3)
    // the corner work of the demo visit (a packed-out bead, an 80 mm return), priced from the demo firm's rates, with its working
    const cornerWork = draft.current.lines.filter((l: any) => /^(Pack out beads|Make good narrow returns): Back bedroom$/.test(l.description))
    expect(cornerWork.map((l: any) => l.description).sort()).toEqual(['Make good narrow returns: Back bedroom', 'Pack out beads: Back bedroom'])
    expect(cornerWork.every((l: any) => l.unitPence > 0)).toBe(true)
    await expectVisible(owner.getByText(/How: Bead packed out along the 3\.40 m corner between Window wall and Window reveal: 3\.40 m/))
    await expectVisible(owner.getByText(/How: Return 80 mm wide .*narrower than the 100 mm corner trowel: made good by hand along 2\.40 m/))
    // making good from Rates and rules (seeded: "Make good round a socket or switch", £12.00), as a labour line
    await owner.getByLabel('Making good from your rates').selectOption({ label: 'Make good round a socket or switch (£12.00 per item)' })
    await owner.getByRole('button', { name: '+ Add making good' }).click()
    await expectVisible(owner.getByTestId('quote-line').last().getByText('How: Making good from Rates and rules: £12.00 per item'))
    // the materials room by room
    await owner.getByTestId('room-estimates').getByText(/Materials room by room/).click()
    await expectVisible(owner.getByTestId('room-estimates').getByText(/How: .* rounded up to/).first())
    await screenshot(owner, 'quote-draft')

    await owner.getByRole('button', { name: 'Send quote' }).click()
    // asked first, in the app's own dialog: it cannot be changed once sent
    await expectText(owner.getByTestId('confirm-dialog'), /After sending it cannot be changed/)
    await screenshot(owner, 'quote-send-confirm')
    await owner.getByTestId('confirm-yes').click()
    await expectText(owner.getByTestId('quote-status'), 'Sent')
    const sent = (await api.get(`/api/quotes/${quoteId}`)).body

    // the customer's e-mail, opened on their own phone
    const mail = await e2e.app.waitForMail('harriet.colley@example.invalid', /Your quote [A-Z]+-Q[1-9]/)
    const link = /(http:\/\/\S+\/q\/[\w-]+)/.exec(mail.text ?? '')![1]!
    const harriet = await e2e.open()
    const customer = harriet.page
    await visit(customer, link)
    await expectText(customer.getByTestId('public-quote-total'), new RegExp(`£${(sent.current.totals.grossPence / 100).toFixed(2).replace(/\B(?=(\d{3})+(?!\d))/g, ',')}`))
    await customer.getByLabel('Type your full name to accept').fill('Harriet Colley')
    await customer.getByRole('button', { name: 'Accept quote' }).click()
    await expectVisible(customer.getByTestId('quote-accepted'))
    await screenshot(customer, 'quote-accepted-by-customer')

    // and the firm sees it
    await reload(owner)
    await expectText(owner.getByTestId('quote-status'), 'Accepted')
    expect((await api.get(`/api/quotes/${quoteId}`)).body.current).toMatchObject({ status: 'accepted', acceptedName: 'Harriet Colley' })
    expect(sent.current.lines.at(-1)).toMatchObject({ kind: 'labour', description: 'Make good round a socket or switch', quantityX1000: 1000, unitPence: 12_00 })
    await e2e.app.waitForMail('@', /accepted by Harriet Colley/)
    expectCleanRun(jess)
    expectCleanRun(harriet)
  })
})
