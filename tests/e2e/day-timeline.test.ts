// A day that runs to time: crew open the day sheet on a phone (390 x 844) and see, for the day,
// a bar per person with each set's mixing, laying on, second coat and trowelling up, the times in
// words and the rule-of-thumb caution; printing keeps it. The office, on a laptop (1366 x 900),
// sees today's timeline on the job page and switches to the next booked day (a half day).
import { describe, expect, it } from 'vitest'
import { addDays, shortDay } from '../../shared/utils/dates'
import { clockTime } from '../../shared/utils/set-timeline'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, textOf, useE2E, visit } from './browser'
import { CREW, OWNER } from './demo'
import { jobBookedToday } from './work'

const e2e = useE2E()

describe('the day to time', () => {
  it('the day sheet shows a timeline per person with the times, on a phone and printed; the job page shows today\'s and the next day\'s', async () => {
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const { jobId, today } = await jobBookedToday(api, e2e.app, e2e.url, CREW.name, 'Maud Linthwaite')
    // the crew member today, and tomorrow for half a day
    const crewId = (await api.get('/api/members')).body.find((m: any) => m.name === CREW.name).userId as string
    const tomorrow = addDays(today, 1)
    expect((await api.put(`/api/jobs/${jobId}/days`, { days: [{ day: today, userId: crewId }, { day: tomorrow, userId: crewId, portion: 'half-day' }] })).status).toBe(200)
    const job = (await api.get(`/api/jobs/${jobId}`)).body
    const start = clockTime(job.timing.dayStartMinutes)
    expect(job.plan.plan.sets.length).toBeGreaterThan(1)

    const kieran = await e2e.open()
    const page = kieran.page
    await signInToDashboard(page, e2e.url, CREW.email, CREW.password)
    await visit(page, `${e2e.url}/jobs/${jobId}/sheet?day=${today}`)
    const day = page.getByTestId(`sheet-day-${today}`)
    const timeline = day.getByTestId('day-timeline')
    await expectVisible(timeline)
    // a bar for the person, read out in words: set 1 is mixed at the start of the day
    const bar = timeline.getByTestId(`timeline-person-${crewId}`).getByRole('img')
    const said = await bar.getAttribute('aria-label')
    expect(said).toMatch(new RegExp(`^${CREW.name}: ${start} mix set 1, `))
    expect(said).toMatch(/\d\d:\d\d lay on set 1, .*\d\d:\d\d second coat set 1, .*\d\d:\d\d trowel up set 1/)
    // each set's times in words on the sheet, and the caution beside them
    const words = timeline.getByTestId('timeline-words')
    expect(await textOf(words.getByTestId('timeline-set-1'))).toMatch(new RegExp(`^Set 1: ${start} mix, \\d\\d:\\d\\d lay on, \\d\\d:\\d\\d second coat, \\d\\d:\\d\\d trowel up, \\d\\d:\\d\\d trowelled up`))
    await expectText(timeline.getByTestId('timeline-caution'), /maker's instructions.*a guide, not a promise/)
    // the sets listed for the day are the sets on its timeline
    const listed = await day.locator('[data-testid^="sheet-set-"]').evaluateAll(els => els.map(e => e.getAttribute('data-testid')!.replace('sheet-set-', '')))
    const timed = await words.locator('[data-testid^="timeline-set-"]').evaluateAll(els => els.map(e => e.getAttribute('data-testid')!.replace('timeline-set-', '')))
    expect(listed.length).toBeGreaterThan(0)
    expect(timed).toEqual(listed)
    // the bar fits the phone's width
    const box = (await bar.boundingBox())!
    expect(box.x).toBeGreaterThanOrEqual(0)
    expect(box.x + box.width).toBeLessThanOrEqual(390)
    await timeline.scrollIntoViewIfNeeded()
    await screenshot(page, 'day-timeline-sheet-phone')

    // printed: the timeline stays, the buttons go
    await page.emulateMedia({ media: 'print' })
    await expectVisible(timeline.getByTestId(`timeline-person-${crewId}`).getByRole('img'))
    await expectVisible(words.getByTestId('timeline-set-1'))
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false)
    await screenshot(page, 'day-timeline-sheet-print')
    await page.emulateMedia({ media: 'screen' })

    // the demo job (seeds/job.ts): two people today, so a bar each, and the job page's card on the phone
    const demo = (await api.get('/api/jobs')).body.find((j: any) => /living room/i.test(j.title))
    expect(demo, 'the demo job').toBeTruthy()
    await visit(page, `${e2e.url}/jobs/${demo.id}/sheet?day=${today}`)
    const demoDay = page.getByTestId(`sheet-day-${today}`).getByTestId('day-timeline')
    await expectVisible(demoDay)
    expect(await demoDay.locator('[data-testid^="timeline-person-"]').count()).toBe(2)
    await demoDay.scrollIntoViewIfNeeded()
    await screenshot(page, 'day-timeline-demo-sheet-phone')
    await visit(page, `${e2e.url}/jobs/${demo.id}`)
    await expectVisible(page.getByTestId('job-timeline').getByTestId('day-timeline'))
    await page.getByTestId('job-timeline').scrollIntoViewIfNeeded()
    await screenshot(page, 'day-timeline-demo-job-phone')
    expectCleanRun(kieran)

    // the office on a laptop: the job page shows today's timeline, and the half day tomorrow on a tap
    const jess = await e2e.open({ desktop: true })
    await jess.page.setViewportSize({ width: 1366, height: 900 })
    await signInToDashboard(jess.page, e2e.url, OWNER.email, OWNER.password)
    await visit(jess.page, `${e2e.url}/jobs/${jobId}`)
    const card = jess.page.getByTestId('job-timeline')
    await expectVisible(card.getByTestId(`timeline-person-${crewId}`))
    expect(await card.getByRole('button', { pressed: true }).textContent()).toMatch(/today/)
    await card.scrollIntoViewIfNeeded()
    await screenshot(jess.page, 'day-timeline-job-desktop')
    await card.getByRole('button', { pressed: false }).click()
    await expectText(card.getByTestId('timeline-day'), shortDay(tomorrow))
    // a half day: its hours are the first half of the firm's day
    const halfEnd = clockTime(job.timing.dayStartMinutes + Math.floor((job.timing.dayEndMinutes - job.timing.dayStartMinutes) / 2))
    await expectText(card.getByTestId('timeline-hours'), `${start} to ${halfEnd}`)
    await screenshot(jess.page, 'day-timeline-job-next-day')
    expectCleanRun(jess)
  })
})
