// The plasterer's picture of a room on a phone (390 x 844): the demo job's living room drawn
// surface by surface with each set's number; a wall moved to another set by tapping it, the
// warning and the new picture and list at once (nothing saved yet), then saved and still there
// after a reload; the day sheet prints the picture (checked with print media, and in grey, where
// only the patterns tell the sets apart). The demo job's moves are put back at the end.
import { mkdirSync } from 'node:fs'
import { writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, expectVisible, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()
const DEMO_TITLE = 'Q-0001: Patch and skim the living room'

function artefacts() {
  const dir = process.env.SETWELL_ARTEFACTS ?? join(process.cwd(), 'tests/artefacts')
  mkdirSync(dir, { recursive: true })
  return dir
}

async function demoJob(api: Client) {
  const list = (await api.get('/api/jobs')).body
  const row = list.find((j: any) => j.title === DEMO_TITLE)
  expect(row, JSON.stringify(list.map((j: any) => j.title))).toBeTruthy()
  return (await api.get(`/api/jobs/${row.id}`)).body
}
const skimSet = (plan: any, id: string): number => plan.sets.find((s: any) => s.tasks.some((t: any) => t.surfaceId === id && t.action === 'skim')).number
const setsOf = (plan: any, id: string, action: string): number[] => plan.sets.filter((s: any) => s.tasks.some((t: any) => t.surfaceId === id && t.action === action)).map((s: any) => s.number)

describe('the picture of a room', () => {
  it('shows each surface once with its set, moves a wall by a tap with the warning at once, saves it, and prints on the day sheet', async () => {
    const api = new Client(e2e.url)
    expect((await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })).status).toBe(200)
    const job = await demoJob(api)
    expect(job.planMoves).toEqual({})
    const room = job.plan.rooms.find((r: any) => r.name === 'Living room')
    const windowWall = room.surfaces.find((s: any) => s.label === 'Window wall')
    const doorWall = room.surfaces.find((s: any) => s.label === 'Door wall')
    try {
      const jess = await e2e.open()
      const page = jess.page
      await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
      await visit(page, `${e2e.url}/jobs/${job.id}`)
      const svg = page.getByTestId('pic-svg-Living room')
      await expectVisible(svg)
      // the room fits the phone's width
      const box = (await svg.boundingBox())!
      expect(box.x).toBeGreaterThanOrEqual(0)
      expect(box.x + box.width).toBeLessThanOrEqual(390)

      // each surface drawn once, with the set its skim is in written on it (the SVG's content)
      const drawn = async () => Object.fromEntries(await Promise.all(room.surfaces.map(async (s: any) => {
        const g = svg.locator(`[data-testid="pic-surface-${s.id}"]`)
        expect(await g.count(), s.label).toBe(1)
        return [s.id, { set: await g.getAttribute('data-set'), number: (await g.locator(`[data-testid="pic-number-${s.id}"]`).textContent())!.trim() }]
      })))
      const before = await drawn()
      for (const s of room.surfaces) expect(before[s.id], s.label).toEqual({ set: String(skimSet(job.plan.plan, s.id)), number: String(skimSet(job.plan.plan, s.id)) })
      expect(await svg.locator('[data-testid^="pic-surface-"]').count()).toBe(room.surfaces.length)
      // the findings and the corners that matter, with their words
      await expectVisible(svg.getByText('Packed-out bead'))
      await expectVisible(svg.getByText(/Out of true/))
      expect(await svg.locator('[data-testid="pic-mark-patch"]').count()).toBe(1)
      expect(await svg.locator('[data-testid="pic-mark-scrim"]').count()).toBe(1)
      await screenshot(page, 'plan-picture-phone')

      // zoom in: the picture grows past the screen and scrolls
      await page.getByRole('button', { name: 'Zoom in' }).first().click()
      await expect.poll(async () => (await svg.boundingBox())!.width).toBeGreaterThan(box.width * 1.4)
      await page.getByRole('button', { name: 'Zoom out' }).first().click()
      await expect.poll(async () => Math.round((await svg.boundingBox())!.width)).toBe(Math.round(box.width))

      // the keyboard: the wall is a button with its name and set; Enter opens the chooser, Escape closes it
      const windowSet = skimSet(job.plan.plan, windowWall.id)
      const windowButton = page.getByRole('button', { name: `Wall 1 (Window wall), set ${windowSet}, tap to move` })
      await windowButton.focus()
      await page.keyboard.press('Enter')
      const chooser = page.getByTestId('set-chooser')
      await expectVisible(chooser)
      await page.keyboard.press('Escape')
      await expectAbsent(chooser)

      // tap the window wall and put its skim in set 1: not after its patch fill and its tight coats, so the plan warns at once
      const fillSets = setsOf(job.plan.plan, windowWall.id, 'fill')
      expect(fillSets.length).toBeGreaterThan(0)
      expect(windowSet).toBeGreaterThan(1)
      await svg.locator(`[data-testid="pic-surface-${windowWall.id}"]`).tap()
      await expectVisible(chooser)
      await expectText(chooser.getByRole('heading'), 'Move Wall 1 (Window wall)')
      // the chooser is fixed to the screen: kept as the phone shows it, not the whole page
      await page.screenshot({ path: join(artefacts(), 'plan-picture-chooser-phone.png') })
      await chooser.getByRole('button', { name: /^Set 1$/ }).click()
      await expectAbsent(chooser)
      await expect.poll(() => svg.locator(`[data-testid="pic-surface-${windowWall.id}"]`).getAttribute('data-set')).toBe('1')
      // outlined and said to be moved, not saved
      expect(await svg.locator(`[data-testid="pic-surface-${windowWall.id}"] [data-testid="pic-moved"]`).count()).toBe(1)
      await expectVisible(page.getByRole('button', { name: 'Wall 1 (Window wall), set 1 (moved, not saved yet), tap to move' }))
      await expectText(page.getByTestId('plan-warnings'), /Wall 1 \(Window wall\)/)
      await expectText(page.getByTestId('plan-warnings'), /fill|patch|tight/i)
      // the list says the same: the skim is in set 1's card now, and the move is not saved yet
      await expectVisible(page.getByTestId('set-1').getByText('Skim · Living room · Wall 1 (Window wall)'))
      await expectText(page.getByTestId('plan-unsaved'), '1 surface moved: not saved yet.')
      expect((await demoJob(api)).planMoves).toEqual({})
      await screenshot(page, 'plan-picture-moved-unsaved')

      // "Put them back" forgets it; a move from the list's select is shown at once the same way
      await page.getByRole('button', { name: 'Put them back' }).click()
      await expectAbsent(page.getByTestId('plan-unsaved'))
      await expect.poll(() => svg.locator(`[data-testid="pic-surface-${windowWall.id}"]`).getAttribute('data-set')).toBe(String(windowSet))
      const doorSet = skimSet(job.plan.plan, doorWall.id)
      await page.getByLabel('Move Living room · Wall 3 (Door wall) to set').selectOption(String(doorSet === 1 ? 2 : 1))
      await expect.poll(() => svg.locator(`[data-testid="pic-surface-${doorWall.id}"]`).getAttribute('data-set')).toBe(String(doorSet === 1 ? 2 : 1))
      await page.getByRole('button', { name: 'Put them back' }).click()
      await expect.poll(() => svg.locator(`[data-testid="pic-surface-${doorWall.id}"]`).getAttribute('data-set')).toBe(String(doorSet))

      // move the window wall again, save, reload: kept
      await svg.locator(`[data-testid="pic-surface-${windowWall.id}"]`).tap()
      await chooser.getByRole('button', { name: /^Set 1$/ }).click()
      await page.getByRole('button', { name: 'Save these moves' }).click()
      await expectAbsent(page.getByTestId('plan-unsaved'))
      const saved = await demoJob(api)
      expect(skimSet(saved.plan.plan, windowWall.id)).toBe(1)
      expect(Object.keys(saved.planMoves)).toEqual([windowWall.id])
      await reload(page)
      await expect.poll(() => page.getByTestId('pic-svg-Living room').locator(`[data-testid="pic-surface-${windowWall.id}"]`).getAttribute('data-set')).toBe('1')
      await expectVisible(page.getByTestId('plan-warnings'))
      await screenshot(page, 'plan-picture-saved')

      // the day sheet: the picture after the notes and before the days, read-only, and in print
      await visit(page, `${e2e.url}/jobs/${job.id}/sheet`)
      const sheet = page.getByTestId('sheet-pictures')
      await expectVisible(sheet)
      const sheetSvg = sheet.getByTestId('pic-svg-Living room')
      expect(await sheetSvg.locator('[data-testid^="pic-surface-"]').count()).toBe(room.surfaces.length)
      expect(await sheetSvg.locator(`[data-testid="pic-surface-${windowWall.id}"]`).getAttribute('data-set')).toBe('1')
      expect(await sheetSvg.getByRole('button').count()).toBe(0)
      const firstDay = page.locator('[data-testid^="sheet-day-"]').first()
      expect(await sheet.evaluate((el, day) => Boolean(day && (el.compareDocumentPosition(day) & Node.DOCUMENT_POSITION_FOLLOWING)), await firstDay.elementHandle())).toBe(true)
      await page.emulateMedia({ media: 'print' })
      await expectVisible(sheetSvg)
      // the zoom buttons are not printed; each set's pattern is (the sets differ in grey, not only in colour)
      expect(await sheet.getByRole('button', { name: 'Zoom in' }).isVisible()).toBe(false)
      const patterns = await sheetSvg.locator('pattern:not([id$="-none"])').evaluateAll(ps => ps.map(p => p.innerHTML.replace(/fill="[^"]*"|stroke="[^"]*"/g, '')))
      expect(new Set(patterns).size).toBe(patterns.length)
      // ...and the day's timeline prints with it: a bar per person and each set's times in words
      const timeline = firstDay.getByTestId('day-timeline')
      await expectVisible(timeline)
      expect(await timeline.locator('[data-testid^="timeline-person-"]').count()).toBeGreaterThan(0)
      expect(await timeline.getByTestId('timeline-words').innerText()).toMatch(/set \d/i)
      const shot = await screenshot(page, 'day-sheet-picture-print')
      await sharp(shot).grayscale().toFile(shot.replace(/\.png$/, '-grey.png'))
      const pdf = await page.pdf({ format: 'A4', printBackground: true })
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
      await writeFile(join(artefacts(), 'day-sheet-picture.pdf'), pdf)
      await page.emulateMedia({ media: 'screen' })
      // the demo quote's PDF carries the same picture on its "How we'll do the work" page (kept to look at)
      const quotePdf = await page.request.get(`${e2e.url}/quotes/${job.quoteId}/pdf`)
      expect(quotePdf.status()).toBe(200)
      await writeFile(join(artefacts(), 'quote-how-we-work.pdf'), await quotePdf.body())
      expectCleanRun(jess)
    }
    finally {
      // leave the demo job as the planner has it, for the other journeys
      const o = job.planOptions
      await api.put(`/api/jobs/${job.id}/plan`, { people: o.people, bagsPerPersonPerSet: o.bagsPerPersonPerSet, coverageM2PerBagX10: Math.round(o.coverageM2PerBag * 10), resetMoves: true })
    }
  })
})
