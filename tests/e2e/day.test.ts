// A whole day in the demo workshop, each person on their own device: the lead plans a sample
// pour on the board (desktop) and signs the shop's tablet in; a caster switches in with a PIN,
// mixes, pours and demoulds it and photographs the piece for the client (tablet); the lead asks
// the client to approve; the client follows the job and approves (phone); the finisher switches
// in on the same tablet, fettles, weighs, readies and packs the piece; the lead dispatches it
// and reads the note; the client sees it dispatched, and the mails reached the client. The lead's
// pages are also checked at tablet width. Screenshots per step: day-NN-*.png.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import sharp from 'sharp'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo, setPinDirect, testDb } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { signIn, waitForMail } from '../setup/http'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
const PINS = { caster: '2917', finisher: '6048' }
type Browser = Awaited<ReturnType<typeof openBrowser>>
let desk: Browser
let tablet: Browser
let phone: Browser
let fx: Awaited<ReturnType<typeof boardFixture>>
let n = 0
const shot = (page: Page, what: string) => screenshot(page, `day-${String(++n).padStart(2, '0')}-${what}`)

beforeAll(async () => {
  ;[desk, tablet, phone] = await Promise.all([openBrowser(VIEWPORTS.desktop), openBrowser(VIEWPORTS.tablet), openBrowser(VIEWPORTS.phone)])
  fx = await boardFixture('day')
  const users = await fx.k('users').whereIn('email', [demo.caster2.email, demo.finisher.email]).select('id', 'email')
  for (const u of users) await setPinDirect(Number(u.id), u.email === demo.finisher.email ? PINS.finisher : PINS.caster)
})
afterAll(async () => {
  await Promise.all([desk, tablet, phone].map(b => b?.close()))
  await testDb()('rate_limits').where('key', 'like', 'pin%').del()
  await closeTestDb()
})

/** The clock in the workshop's zone, as the board's time field takes it (HH:MM, on a 5-minute step). */
function localClock(at: Date, zone: string) {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone: zone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(at)
  const hh = parts.find(p => p.type === 'hour')!.value
  const mm = Math.floor(Number(parts.find(p => p.type === 'minute')!.value) / 5) * 5
  return `${hh}:${String(mm).padStart(2, '0')}`
}
function localDay(at: Date, zone: string) {
  return new Intl.DateTimeFormat('en-CA', { timeZone: zone }).format(at)
}

async function switchIn(page: Page, name: string, pin: string, home: string) {
  await page.getByRole('heading', { level: 1, name: 'Who is working?' }).waitFor()
  await page.getByRole('button', { name: new RegExp(name) }).click()
  const keypad = page.getByTestId('tablet-keypad')
  for (const d of pin) await keypad.getByRole('button', { name: d, exact: true }).click()
  await page.getByTestId('tablet-ok').click()
  await page.waitForURL(`${base}${home}`)
}

describe('a whole day', () => {
  it('plan, cast with a photo, approve, finish, dispatch and follow, each role on its own device', async () => {
    // the job: a ceiling rose with a sample for the client (Ada, of the demo's first client organisation)
    const client = await fx.k('users').where({ email: demo.client1.email }).first('id')
    const jobId = await fx.job({ title: 'Morning room ceiling rose', sample_required: true, due_on: '2031-06-30' })
    await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: jobId, user_id: client.id })
    const mouldId = await fx.mould({ casts: 'Ceiling rose, 450 mm' })
    await fx.item(jobId, mouldId, { description: 'Ceiling rose, 450 mm', pieces_needed: 1 })
    const job = await fx.k('jobs').where({ id: jobId }).first('code')
    const mould = await fx.k('moulds').where({ id: mouldId }).first('code')
    const ws = await fx.k('workshops').where({ id: fx.workshopId }).first('timezone')
    const zone = ws.timezone as string

    // 1. the lead plans the sample pour on today's board, starting this five minutes
    const lead = await desk.context.newPage()
    await signInThroughForm(lead, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await shot(lead, 'lead-today')
    await lead.goto(`${base}/lead/board`)
    await lead.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
    await lead.locator('html[data-hydrated]').waitFor()
    await lead.getByTestId('board-new-pour').click()
    const dialog = lead.getByRole('dialog', { name: 'New pour' })
    const itemValue = await dialog.getByLabel('Job item').locator('option', { hasText: job.code }).getAttribute('value')
    await dialog.getByLabel('Job item').selectOption(itemValue!)
    await dialog.getByLabel('Mould').selectOption({ label: `${mould.code} · Ceiling rose, 450 mm` })
    const now = new Date()
    await dialog.getByLabel('Date').fill(localDay(now, zone))
    await dialog.getByLabel('Prep starts at').fill(localClock(now, zone))
    await dialog.getByLabel('Caster').selectOption({ label: demo.caster2.name })
    await dialog.getByText('This is the sample cast').click()
    await shot(lead, 'lead-new-pour')
    await dialog.getByRole('button', { name: 'Put on the board' }).click()
    await expect.poll(() => lead.getByTestId('board-message').textContent({ timeout: 1000 }).catch(() => ''), { timeout: 15_000 }).toMatch(new RegExp(`Planned ${job.code} on ${mould.code}`))
    const pour = await fx.k('pours').where({ mould_id: mouldId }).first('id', 'is_sample')
    expect(pour.is_sample).toBe(true)
    await shot(lead, 'lead-board')

    // 2. the lead makes the shop's tablet a shared tablet
    const tab = await tablet.context.newPage()
    await signInThroughForm(tab, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(tab, `${base}/lead/people`)
    await tab.getByLabel('Name for this device').fill('Casting bench tablet')
    await tab.getByRole('button', { name: 'Use this device as a shared tablet' }).click()
    await tab.getByRole('dialog', { name: 'Make this device a shared tablet?' }).getByRole('button', { name: 'Make it a shared tablet' }).click()
    await tab.waitForURL(`${base}/tablet`)
    await shot(tab, 'tablet-picker')

    // 3. the caster switches in with her PIN, mixes, pours and demoulds, and photographs the piece
    await switchIn(tab, demo.caster2.name, PINS.caster, '/floor')
    const card = tab.locator(`[data-testid="floor-card"][data-pour-id="${pour.id}"]`)
    await card.waitFor()
    await shot(tab, 'caster-floor')
    const step = async (fill: () => Promise<void>, state: string, early = false) => {
      await card.getByTestId('floor-next').click()
      // a demould straight after pouring is before the window: the card asks first, and she goes on
      if (early) await card.getByTestId('ask-confirm').click()
      await fill()
      await card.getByTestId('floor-submit').click()
      await expect.poll(() => card.getAttribute('data-state'), { timeout: 15_000 }).toBe(state)
      await expect.poll(() => card.getByTestId('floor-state').textContent(), { timeout: 15_000 }).not.toMatch(/sending/)
    }
    await step(() => card.getByLabel('Water °C').fill('17'), 'mixing')
    await step(async () => {
      await card.getByLabel('Plaster kg (weighed)').fill('2.50')
      await card.getByLabel('Water kg (weighed)').fill('1.75')
      await card.getByLabel('Shop °C').fill('18')
    }, 'setting')
    await shot(tab, 'caster-setting')
    await step(() => card.getByText('Sound', { exact: true }).click(), 'demoulded', true)
    await card.getByRole('button', { name: 'Photo of this piece' }).click()
    const photo = await sharp({ create: { width: 1200, height: 900, channels: 3, background: '#ece4d6' } }).jpeg().toBuffer()
    await card.locator('input[type=file]').first().setInputFiles({ name: 'rose.jpg', mimeType: 'image/jpeg', buffer: photo })
    await card.getByLabel('Caption').fill('Sample rose out of the mould')
    await card.getByText('Share with the client').click()
    await card.getByRole('button', { name: 'Upload photo' }).click()
    await expect.poll(() => card.getByTestId('floor-photo').textContent(), { timeout: 15_000 }).toMatch(/1 photo added/)
    await shot(tab, 'caster-demoulded-photo')
    const piece = await fx.k('pieces').where({ pour_id: pour.id }).first('id', 'mark', 'state')
    expect(piece.state).toBe('to_fettle')

    // 4. the lead asks the client to approve the sample
    await gotoHydrated(lead, `${base}/lead/jobs/${jobId}`)
    await lead.getByRole('button', { name: 'Sample ready: ask the client to approve' }).click()
    await expect.poll(() => fx.k('jobs').where({ id: jobId }).first('sample_state').then(r => r.sample_state), { timeout: 15_000 }).toBe('awaiting_approval')
    await shot(lead, 'lead-sample-asked')

    // 5. the client, on her phone, sees the photo and approves
    const ada = await phone.context.newPage()
    await signInThroughForm(ada, base, demo.client1.email, DEMO_PASSWORD, '/client')
    await ada.getByRole('link', { name: new RegExp(job.code) }).click()
    await ada.getByRole('heading', { level: 1, name: new RegExp(job.code) }).waitFor()
    await ada.getByRole('button', { name: /^Open photo: Sample rose out of the mould/ }).waitFor()
    expect(await ada.content()).not.toContain(demo.caster2.name) // nothing internal: not who cast it
    await shot(ada, 'client-job')
    await ada.getByLabel('Approve the sample: go ahead with the run').check()
    await ada.getByLabel('Comment').fill('Lovely crisp leaves. Go ahead.')
    await ada.getByRole('button', { name: 'Approve sample' }).click()
    await ada.getByText(/the sample is approved/).waitFor()
    await shot(ada, 'client-approved')

    // 6. the finisher takes the tablet: fettles, weighs, readies and packs the piece
    await tab.getByTestId('switch-person').click()
    await switchIn(tab, demo.finisher.name, PINS.finisher, '/finishing')
    const pc = tab.locator(`[data-testid="piece-card"][data-piece-id="${piece.id}"]`)
    await pc.waitFor()
    await shot(tab, 'finisher-queue')
    const finish = async (fill: () => Promise<void>, state: string, tab_?: string) => {
      await pc.getByTestId('piece-next').click()
      await fill()
      await pc.getByTestId('finishing-submit').click()
      if (tab_) await tab.getByTestId(`tab-${tab_}`).click()
      await expect.poll(() => pc.getAttribute('data-state', { timeout: 1000 }).catch(() => null), { timeout: 15_000 }).toBe(state)
      await expect.poll(() => pc.getByTestId('piece-state').textContent(), { timeout: 15_000 }).not.toMatch(/sending/)
    }
    await finish(async () => {
      await pc.getByLabel('Room °C').fill('28')
      await pc.getByLabel('Humidity %').fill('45')
    }, 'drying', 'drying')
    const dry = await fx.k('pieces').where({ id: piece.id }).first('dry_mass_kg', 'dry_by')
    expect(dry.dry_by).not.toBeNull()
    await finish(() => pc.getByLabel('Weighed kg').fill(Number(dry.dry_mass_kg).toFixed(2)), 'drying')
    // a weighing leaves the piece drying, so finish() cannot tell it landed: the register can
    await expect.poll(() => fx.k('piece_weighings').where({ piece_id: piece.id }).count({ n: '*' }).then(r => Number(r[0]!.n)), { timeout: 15_000 }).toBe(1)
    await shot(tab, 'finisher-weighed')
    // constant weight needs a second weighing a day later, longer than this journey's day: the
    // lead passes the piece as dry (kept in the register as passed), and the finisher packs it
    // the tablet hears the lead's step over its live connection: it is open ("Live" in its header)
    await tab.locator('[data-testid="live-status"][data-status="online"]').waitFor()
    await gotoHydrated(lead, `${base}/finishing`)
    const leadCard = lead.locator(`[data-testid="piece-card"][data-piece-id="${piece.id}"]`)
    await lead.getByTestId('tab-drying').click()
    await leadCard.getByTestId('piece-more').click()
    await leadCard.getByTestId('piece-ready').click()
    await expect(leadCard.getByTestId('ready-missing').textContent()).resolves.toMatch(/second weighing at least 24 hours/)
    await leadCard.getByTestId('ready-override').check()
    await leadCard.getByTestId('finishing-submit').click()
    await expect.poll(async () => (await fx.k('pieces').where({ id: piece.id }).first('state')).state, { timeout: 15_000 }).toBe('ready')
    await tab.getByTestId('tab-ready').click()
    await expect.poll(() => pc.getAttribute('data-state', { timeout: 1000 }).catch(() => null), { timeout: 15_000 }).toBe('ready')
    await finish(async () => {}, 'packed', 'packed')
    await shot(tab, 'finisher-packed')

    // 7. the lead dispatches the job and reads the note
    await gotoHydrated(lead, `${base}/lead/jobs/${jobId}`)
    const panel = lead.getByTestId('dispatch-panel')
    await panel.getByText(piece.mark).waitFor()
    await panel.getByTestId('dispatch-make').click()
    await lead.waitForURL(/\/dispatches\/\d+$/)
    const note = lead.getByTestId('dispatch-note')
    await note.waitFor()
    await expect(note.textContent()).resolves.toContain(piece.mark)
    await shot(lead, 'lead-dispatch-note')

    // 8. the client follows: one of one dispatched; the mails reached her
    await ada.reload()
    await expect.poll(() => ada.locator('[data-stage="dispatched"]').first().textContent(), { timeout: 15_000 }).toBe('1 / 1')
    await shot(ada, 'client-dispatched')
    const leadCookie = await signIn(demo.lead.email, DEMO_PASSWORD)
    for (const subject of [`Sample ready for your approval: ${job.code}`, `New photos of ${job.code}`, `Ready for dispatch: ${job.code}`]) {
      await waitForMail(leadCookie, demo.client1.email, subject)
    }

    // 9. the lead's pages at tablet width
    await lead.setViewportSize(VIEWPORTS.tablet)
    for (const [path, heading] of [['/lead', /Today/], ['/lead/board', /Pour board/], [`/lead/jobs/${jobId}`, new RegExp(job.code)]] as const) {
      await lead.goto(`${base}${path}`)
      await lead.getByRole('heading', { level: 1, name: heading }).waitFor()
      await shot(lead, `lead-tablet-${path.split('/').filter(Boolean).slice(0, 2).join('-')}`)
    }
    expect(await fx.k('events').where({ entity: 'piece', entity_id: String(piece.id) }).orderBy('id').pluck('type'))
      .toEqual(['piece.created', 'piece.fettled', 'piece.weighed', 'piece.ready', 'piece.packed', 'piece.dispatched'])
  }, 300_000)
})
