// From enquiry to paid, the whole way in the browser where money moves: the lead prices a take-off
// (our own worked example's drawing room) and sends the quote; the client reads its PDF and
// accepts on a phone; the lead makes the job; the client pays the deposit on the local payment
// fake's checkout page, which opens the deposit gate (a pour refused before it starts after); the
// pours, finishing and packing go through the API and the fixtures (the floor and finishing
// tablets have browser journeys of their own: floor.test.ts, finishing.test.ts); the lead sends
// the pieces on a dispatch note and issues its invoice from the lines the note fills in; the
// client's contact gets the invoice mail with its PDF (captured by the SMTP fake, listed on the
// lead's captured-mail page); the lead reads the job's cost against its estimate.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { testContext } from '../setup/context'
import { seriousAxeViolations } from '../setup/axe'
import { fillDrawingRoomTakeOff, saveJourneyRates } from '../setup/quote-journey'
import { call, signIn, waitForMail } from '../setup/http'
import { boardFixture } from '../setup/board-fixtures'
import { pdfText } from '../setup/pdf-text'

const base = testContext().baseUrl
const HOUR = 3_600_000
const ago = (ms: number) => new Date(Date.now() - ms).toISOString()
let desk: Awaited<ReturnType<typeof openBrowser>>
let phone: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  desk = await openBrowser(VIEWPORTS.desktop)
  phone = await openBrowser(VIEWPORTS.phone)
})
afterAll(async () => {
  await desk?.close()
  await phone?.close()
  await closeTestDb()
})

describe('from enquiry to paid', () => {
  it('prices, accepts, takes the deposit, starts the moulds, dispatches, invoices with its mail and shows the cost', async () => {
    const tag = randomUUID().slice(0, 4).toUpperCase()
    const lead = await desk.context.newPage()
    await signInThroughForm(lead, base, demo.lead.email, DEMO_PASSWORD)

    // enquiry → take-off → priced quote (the rates and figures of tests/e2e/quotes.test.ts)
    await lead.goto(`${base}/lead/quotes`)
    await lead.getByRole('heading', { level: 1, name: 'Quotes' }).waitFor()
    await lead.locator('html[data-hydrated]').waitFor()
    await saveJourneyRates(lead)
    await fillDrawingRoomTakeOff(lead, `Drawing room cornice ${tag}`)
    await lead.getByRole('button', { name: 'Price this take-off' }).click()
    await lead.waitForURL(/\/lead\/quotes\/\d+$/)
    // by hand (tests/e2e/quotes.test.ts): net £862.84, tax £172.57, total £1,035.41
    await lead.getByText('£1,035.41', { exact: true }).waitFor()
    await lead.getByRole('button', { name: 'Send to client' }).click()
    await lead.getByRole('dialog').getByRole('button', { name: 'Send to client' }).click()
    await lead.getByText(/this revision is now frozen/).waitFor()
    const quoteUrl = lead.url()

    // the client, on a phone: reads the quote's PDF and accepts it
    const client = await phone.context.newPage()
    await signInThroughForm(client, base, demo.client1.email, DEMO_PASSWORD)
    await client.goto(`${base}/client`)
    await client.getByRole('link', { name: new RegExp(`Drawing room cornice ${tag}`) }).click()
    await client.getByRole('heading', { level: 1, name: new RegExp(`Drawing room cornice ${tag}`) }).waitFor()
    await client.locator('html[data-hydrated]').waitFor()
    const pdfHref = await client.getByRole('link', { name: 'Download the quote (PDF)' }).getAttribute('href')
    const quotePdf = await client.request.get(`${base}${pdfHref}`)
    expect(quotePdf.headers()['content-type']).toBe('application/pdf')
    const quoteText = (await pdfText(await quotePdf.body())).join(' ')
    expect(quoteText).toContain(`Drawing room cornice ${tag}`)
    expect(quoteText).toContain('£1,035.41')
    await client.getByRole('button', { name: 'Accept for £1,035.41' }).click()
    await client.getByText(/the workshop has your acceptance/).waitFor()

    // the lead makes the job: one run item, a deposit of 30 % of £1,035.41 = £310.623 → £310.62
    await lead.goto(quoteUrl)
    await lead.getByRole('heading', { name: 'Make the job' }).waitFor()
    await lead.locator('html[data-hydrated]').waitFor()
    await lead.getByText(/asking a deposit of £310\.62 before the moulds start/).waitFor()
    await lead.getByLabel('Job code').fill(`J-${tag}`)
    await lead.getByLabel('Site').selectOption({ label: 'A new site…' })
    await lead.getByLabel('Site name').fill(`Fernhill drawing room ${tag}`)
    await lead.getByLabel('Address').fill('1 Fernhill Lane, Example Town')
    await lead.getByRole('button', { name: 'Make the job' }).click()
    await lead.waitForURL(/\/lead\/jobs\/\d+$/)
    const jobId = Number(/\/lead\/jobs\/(\d+)$/.exec(lead.url())![1])

    // the moulds wait for the deposit: a pour of the job is pencilled in but refused at the start
    // (the floor's tablet journey is floor.test.ts; here its steps go through the API)
    const fx = await boardFixture('paid')
    const leadApi = await signIn(demo.lead.email, DEMO_PASSWORD)
    const casterApi = await signIn(demo.caster1.email, DEMO_PASSWORD)
    const item = await fx.k('job_items').where({ job_id: jobId }).first('id', 'pieces_needed')
    expect(Number(item.pieces_needed)).toBe(3)
    // the plaster of the item, which the lead sets on the job page (a journey of its own)
    await fx.k('job_items').where({ id: item.id }).update({ grade_id: fx.gradeId, consistency: 70 })
    // the lot the casters mix from, at £18.50 a 25 kg bag
    const lotId = await fx.lot({ price_per_bag: 1850 })
    const step = (pourId: number, body: Record<string, unknown>) => call(`/api/pours/${pourId}/actions`, { method: 'POST', cookie: casterApi, body: { actionId: randomUUID(), ...body } })
    const pours: number[] = []
    for (const day of ['2031-04-07', '2031-04-08', '2031-04-09']) {
      const planned = await call('/api/pours', { method: 'POST', cookie: leadApi, body: { mouldId: await fx.mould(), slotStart: `${day}T09:00:00Z`, jobItemId: Number(item.id), casterId: fx.casterId } })
      expect(planned.status, JSON.stringify(planned.data)).toBe(201)
      pours.push(planned.data.id)
    }
    const refused = await step(pours[0]!, { kind: 'start_mixing', version: 1, waterTempC: 18 })
    expect(refused.status).toBe(409)
    expect(refused.data.message).toMatch(new RegExp(`Job J-${tag} waits for its deposit`))

    // the client pays the deposit on the payment fake's own checkout page
    await gotoHydrated(client, `${base}/client/jobs/${jobId}`)
    const deposit = client.getByTestId('client-deposit')
    await deposit.getByText('The workshop starts making your moulds once the deposit is paid.').waitFor()
    expect(await seriousAxeViolations(client)).toEqual([])
    await deposit.getByRole('button', { name: 'Pay deposit of £310.62' }).click()
    await client.waitForURL(u => !u.href.startsWith(base))
    await client.getByRole('button', { name: /Pay/ }).click()
    await client.waitForURL(u => u.href.startsWith(`${base}/client/jobs/${jobId}`))
    await client.getByText('Thank you: your deposit is paid.').waitFor()
    await client.getByTestId('client-deposit-paid').getByText('£310.62').waitFor()
    await screenshot(client, 'paid-client-deposit')

    // the gate is open: the moulds start; each pour is mixed, poured and demoulded one after
    // another, back-dated as tests/setup/finishing-fixtures.ts does (floor steps by API)
    for (const [n, pour] of pours.entries()) {
      const back = (7 - 3 * n) * HOUR
      const started = await step(pour, { kind: 'start_mixing', version: 1, lotId, waterTempC: 18, at: ago(back + HOUR) })
      expect(started.status, JSON.stringify(started.data)).toBe(200)
      const poured = await step(pour, { kind: 'poured', version: 2, plasterKg: 2.9, waterKg: 2.03, shopTempC: 17, at: ago(back + 0.9 * HOUR) })
      expect(poured.status, JSON.stringify(poured.data)).toBe(200)
      const demoulded = await step(pour, { kind: 'demoulded', version: 3, result: 'sound', at: ago(back) })
      expect(demoulded.status, JSON.stringify(demoulded.data)).toBe(200)
    }
    // fettled, dried and packed: the finishing tablet's journey is finishing.test.ts
    const pieces = await fx.k('pieces').whereIn('pour_id', pours).update({ state: 'packed' }).returning(['id', 'mark'])
    expect(pieces).toHaveLength(3)

    // the lead sends the three lengths on a dispatch note
    await gotoHydrated(lead, `${base}/lead/jobs/${jobId}`)
    const dispatch = lead.getByTestId('dispatch-panel')
    for (const p of pieces) await dispatch.getByRole('checkbox', { name: new RegExp(p.mark) }).check()
    await dispatch.getByTestId('dispatch-make').click()
    // the printed note opens
    await lead.waitForURL(/\/dispatches\/\d+$/)
    const noteNo = (await lead.getByTestId('note-no').textContent())!.trim()
    expect(noteNo).toMatch(/^DN-\d{4}-\d{4}$/)

    // the invoice for the note: its lines come from the note, priced from the quote. The run's
    // price by hand: 3 × 40.25 + new mould 483.00 + fettling 31.05 + plaster 42.56 = £677.36,
    // £225.786… → £225.79 a length; 3 × 225.79 = £677.37 net, tax 20 % £135.474 → £135.47,
    // total £812.84, less the deposit £310.62: £502.22 due
    await gotoHydrated(lead, `${base}/lead/jobs/${jobId}`)
    const invoices = lead.getByTestId('invoices-panel')
    await invoices.getByLabel('Dispatch note').selectOption({ label: noteNo })
    await invoices.getByTestId('invoice-lines-filled').getByText(`Lines filled from ${noteNo}: 1 item.`, { exact: false }).waitFor()
    expect(await invoices.getByLabel('Description').inputValue()).toBe('Egg-and-dart 150, Drawing room')
    expect(await invoices.getByLabel('Quantity').inputValue()).toBe('3')
    expect(await invoices.getByLabel('Unit price').inputValue()).toBe('225.79')
    expect(await seriousAxeViolations(lead)).toEqual([])
    await invoices.getByRole('button', { name: 'Issue invoice' }).click()
    const issued = invoices.getByText(/Invoice INV-\d{4} issued: £502\.22 due\./)
    await issued.waitFor()
    const number = /INV-\d{4}/.exec((await issued.textContent())!)![0]
    await screenshot(lead, 'paid-invoice-issued')

    // the client's contact gets the invoice mail with its PDF
    const mail = await waitForMail(leadApi, demo.client1.email, `Invoice ${number}`)
    expect(mail.text).toContain('£812.84')
    expect(mail.attachments.map(a => [a.name, a.type])).toEqual([[`${number}.pdf`, 'application/pdf']])
    const invoiceText = (await pdfText(mail.attachments[0]!.bytes)).join(' ')
    expect(invoiceText).toContain(`Invoice ${number}`)
    expect(invoiceText).toContain(`dispatch note ${noteNo}`)
    expect(invoiceText).toContain('£812.84')
    expect(invoiceText).toContain('£502.22')
    // the client finds it on their job page, on the phone, and its PDF is the one mailed
    await gotoHydrated(client, `${base}/client/jobs/${jobId}`)
    const clientInvoice = client.getByRole('link', { name: number })
    await clientInvoice.waitFor()
    await client.getByText(/total £812\.84 less your deposit £310\.62 · due £502\.22/).waitFor()
    const clientPdf = await client.request.get(`${base}${await clientInvoice.getAttribute('href')}`)
    expect((await pdfText(await clientPdf.body())).join(' ')).toBe(invoiceText)
    expect(await seriousAxeViolations(client)).toEqual([])
    await lead.goto(`${base}/lead/mails`)
    await lead.getByRole('heading', { level: 1, name: 'Captured mail' }).waitFor()
    await lead.getByRole('list', { name: `Attachments of Invoice ${number}: J-${tag} Drawing room cornice ${tag}` }).getByText(`${number}.pdf`).waitFor()
    expect(await seriousAxeViolations(lead)).toEqual([])

    // the cost against the estimate, by hand at the shop's own rates: the run's share is mould
    // 420.00 + 3 × 35.00 + fettling 27.00 + plaster 2 bags × 18.50 = £589.00; the quote's whole
    // estimate adds fixing 8.1 m × 12.50 = 101.25 and a delivery 60.00: £750.25
    await gotoHydrated(lead, `${base}/lead/jobs/${jobId}`)
    // The actual cost so far is the plaster (no labour rate is set): each pour's 2.9 kg of a
    // 25 kg bag at £18.50 = £2.146 → £2.15, three pours £6.45, so £743.80 under the estimate
    const summary = lead.getByTestId('job-cost-summary')
    await summary.getByText('£750.25', { exact: true }).waitFor()
    expect((await summary.textContent())!.replace(/\s+/g, ' ')).toMatch(/£6\.45 against the estimate of £750\.25 \(quote Q-\d{4} revision 1\): £743\.80 under/)
    const row = lead.getByTestId('job-cost-table').getByRole('row', { name: /Egg-and-dart 150, Drawing room/ })
    await row.getByRole('cell', { name: '£589.00', exact: true }).waitFor()
    expect(await row.getByRole('cell').first().textContent()).toBe('£6.45')
    expect(await seriousAxeViolations(lead)).toEqual([])
    await screenshot(lead, 'paid-job-cost')
  }, 240_000)
})
