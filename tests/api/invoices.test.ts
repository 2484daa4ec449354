// Invoices: per stage or per dispatch note, numbered per workshop one after another (also when
// issued at once), tax on the sum, the deposit paid credited once, never edited (voided with a
// reason), as PDF, mailed with the PDF to the client's contacts who have invoice mail on, in the
// client's portal for their own jobs only, and as CSV for the accounts.
// Figures are our own worked example, by hand beside them (rates invented; tax 20 %).
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, capturedMails, signIn, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop, testDb } from '../setup/fixtures'
import { pdfText } from '../setup/pdf-text'

let lead = ''
let ada = ''
let ravi = ''
let jobId = 0

const rates = {
  currency: 'GBP', plasterPerBag: 1850, mouldPerProfile: 42000, castPerLength: 3500, castPerPiece: 2800,
  fettlePerPiece: 900, fixPerMetre: 1250, deliveryPerTrip: 6000, marginPct: 15, taxPct: 20, depositPct: 30,
}
// 3 lengths at £40.25 = £120.75 and a ceiling centre at £32.20: net £152.95, tax 20 % £30.59, total £183.54
const stageLines = [{ description: 'Egg-and-dart 150, Drawing room', quantity: 3, unitPrice: 4025 }, { description: 'Ceiling centre 600', quantity: 1, unitPrice: 3220 }]
// 2 trips at £50.00: net £100.00, tax £20.00, total £120.00
const tripLines = [{ description: 'Delivery to site', quantity: 2, unitPrice: 5000 }]
const issue = (body: unknown, job = jobId, cookie = lead) => call(`/api/jobs/${job}/invoices`, { method: 'POST', cookie, body })

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ada = await signIn(demo.client1.email, DEMO_PASSWORD)
  ravi = await signIn(demo.client2.email, DEMO_PASSWORD)
  const current = await call('/api/rates', { cookie: lead })
  expect((await call('/api/rates', { method: 'PUT', cookie: lead, body: { ...rates, version: current.data.version } })).status).toBe(200)
  const job = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `INV-${randomUUID().slice(0, 6)}`, title: 'Invoice test' } })
  jobId = job.data.id
  expect((await call(`/api/jobs/${jobId}/members`, { method: 'POST', cookie: lead, body: { email: demo.client1.email } })).status).toBeLessThan(300)
  expect((await call(`/api/jobs/${jobId}/deposit`, { method: 'PUT', cookie: lead, body: { depositMinor: 10000 } })).status).toBe(200)
  expect((await call(`/api/jobs/${jobId}/payments`, { method: 'POST', cookie: lead, body: { amount: 10000, method: 'bank_transfer', paidOn: '2026-12-01' } })).status).toBe(201)
})
afterAll(closeTestDb)

describe('invoices', () => {
  it('prices the lines, taxes the sum, credits the deposit paid once and numbers them one after another', async () => {
    const first = await issue({ stage: 'Drawing room cast', lines: stageLines })
    expect(first.status, JSON.stringify(first.data)).toBe(201)
    expect(first.data).toMatchObject({ number: expect.stringMatching(/^INV-\d{4}$/), status: 'issued', currency: 'GBP', net: 15295, tax: 3059, total: 18354, depositCredit: 10000, amountDue: 8354 })
    expect(first.data.lines.map((l: { amount: number }) => l.amount)).toEqual([12075, 3220])
    // the deposit is credited once: the next invoice has none of it left
    const second = await issue({ stage: 'Delivery', lines: tripLines })
    expect(second.data).toMatchObject({ net: 10000, tax: 2000, total: 12000, depositCredit: 0, amountDue: 12000 })
    expect(Number(second.data.number.slice(4))).toBe(Number(first.data.number.slice(4)) + 1)

    // voided with its reason, never edited: the credit is free again for the next invoice
    const voided = await call(`/api/invoices/${first.data.id}/void`, { method: 'POST', cookie: lead, body: { reason: 'Wrong stage named' } })
    expect(voided.data).toMatchObject({ status: 'void', voidReason: 'Wrong stage named', total: 18354 })
    expect((await call(`/api/invoices/${first.data.id}/void`, { method: 'POST', cookie: lead, body: { reason: 'again' } })).status).toBe(409)
    expect((await call(`/api/invoices/${first.data.id}`, { method: 'PATCH', cookie: lead, body: { lines: tripLines } })).status).toBeGreaterThanOrEqual(400)
    const third = await issue({ stage: 'Drawing room cast, again', lines: stageLines })
    expect(third.data).toMatchObject({ total: 18354, depositCredit: 10000, amountDue: 8354 })
  })

  it('numbers invoices issued at the same moment one after another, never the same number twice', async () => {
    const made = await Promise.all(Array.from({ length: 5 }, (_, i) => issue({ stage: `At once ${i}`, lines: tripLines })))
    expect(made.map(r => r.status)).toEqual([201, 201, 201, 201, 201])
    const numbers = made.map(r => Number(r.data.number.slice(4))).sort((a, b) => a - b)
    expect(new Set(numbers).size).toBe(5)
    expect(numbers.at(-1)! - numbers[0]!).toBe(4)
  })

  it('is for a dispatch note of the job or a named stage, in the user\'s words', async () => {
    const neither = await issue({ lines: tripLines })
    expect(neither.status).toBe(422)
    expect(JSON.stringify(neither.data)).toMatch(/Name the stage, or choose the dispatch note/)
    const k = testDb()
    const otherJob = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `INV-${randomUUID().slice(0, 6)}`, title: 'Another' } })).data.id
    const [note] = await k('dispatches').insert({ workshop_id: (await k('jobs').where({ id: jobId }).first('workshop_id')).workshop_id, job_id: otherJob, note_no: `DN-T-${randomUUID().slice(0, 4)}`, dispatched_at: new Date() }).returning(['id', 'note_no'])
    const wrong = await issue({ dispatchId: Number(note.id), lines: tripLines })
    expect(wrong.status).toBe(422)
    expect(JSON.stringify(wrong.data)).toMatch(/Dispatch note is not one of this job's/)
    const right = await issue({ dispatchId: Number(note.id), lines: tripLines }, otherJob)
    expect(right.status).toBe(201)
    expect(right.data).toMatchObject({ dispatchNote: note.note_no, stage: null })
  })

  it('makes a PDF with the workshop, lines, tax, the deposit credited and what is due', async () => {
    const inv = (await issue({ stage: 'PDF stage', lines: stageLines })).data
    const res = await fetch(`${baseUrl()}/api/invoices/${inv.id}/pdf`, { headers: { cookie: lead } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    const text = (await pdfText(await res.arrayBuffer())).join(' ')
    expect(text).toContain(`Invoice ${inv.number}`)
    expect(text).toContain('Egg-and-dart 150, Drawing room')
    expect(text).toContain('£183.54') // the worked example's total
    expect(text).toContain('£30.59') // its tax
    expect(text).toContain(`£${(inv.amountDue / 100).toFixed(2)}`)
  })

  it('shows the client the invoices of their own jobs only; another workshop\'s invoice is a 404', async () => {
    const inv = (await issue({ stage: 'Client stage', lines: tripLines })).data
    const mine = await call('/api/client/invoices', { cookie: ada })
    expect(mine.data.map((i: { id: number }) => i.id)).toContain(inv.id)
    expect((await call('/api/client/invoices', { cookie: ravi })).data.map((i: { id: number }) => i.id)).not.toContain(inv.id)
    expect((await fetch(`${baseUrl()}/api/client/invoices/${inv.id}/pdf`, { headers: { cookie: ada } })).status).toBe(200)
    expect((await fetch(`${baseUrl()}/api/client/invoices/${inv.id}/pdf`, { headers: { cookie: ravi } })).status).toBe(404)

    const other = await makeOtherWorkshop()
    const k = testDb()
    const [oInv] = await k('invoices').insert({ workshop_id: other.workshopId, job_id: other.jobId, number: 1, stage: 'Theirs', lines: '[]', currency: 'GBP', net: 777777, tax: 0, total: 777777, amount_due: 777777 }).returning('id')
    expect((await call(`/api/invoices/${oInv.id}`, { cookie: lead })).status).toBe(404)
    expect((await fetch(`${baseUrl()}/api/invoices/${oInv.id}/pdf`, { headers: { cookie: lead } })).status).toBe(404)
    expect((await call(`/api/invoices/${oInv.id}/void`, { method: 'POST', cookie: lead, body: { reason: 'not ours' } })).status).toBe(404)
    expect((await call('/api/invoices', { cookie: lead })).data.map((i: { id: number }) => i.id)).not.toContain(Number(oInv.id))

    // the accounts' CSV: this workshop's invoices only, money as a decimal under a header naming the currency
    const csv = await fetch(`${baseUrl()}/api/invoices/export`, { headers: { cookie: lead } })
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    const body = (await csv.text()).replace(/^\uFEFF/, '')
    const [header, ...rows] = body.trim().split(/\r?\n/)
    expect(header).toBe('invoice,issued_on,job,client,for,status,currency,net_GBP,tax_GBP,total_GBP,deposit_credit_GBP,amount_due_GBP,void_reason')
    expect(rows.find(r => r.startsWith(`${inv.number},`))).toMatch(/,issued,GBP,100\.00,20\.00,120\.00,/)
    expect(rows.some(r => r.includes('Wrong stage named') && r.includes(',void,'))).toBe(true)
    expect(body).not.toContain('7777.77')
  })

  it('mails the PDF to the client\'s contacts with invoice mail on, once; a void mails nothing', async () => {
    const tag = randomUUID().slice(0, 6)
    const org = (await call('/api/clients', { method: 'POST', cookie: lead, body: { name: `Invoice mail ${tag}` } })).data
    const on = `accounts-${tag}@vane.example.test`
    const off = `site-${tag}@vane.example.test`
    const made = await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Una Accounts', email: on } })
    expect(made.data).toMatchObject({ mailInvoices: true })
    const offContact = await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Sid Site', email: off, mailInvoices: false } })
    expect(offContact.data).toMatchObject({ mailInvoices: false, mailDispatch: true })
    expect((await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Bad', email: `bad-${tag}@vane.example.test`, mailInvoices: 'yes' } })).data.message).toMatch(/Invoice mail/)
    const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `IM-${tag}`, title: 'Invoice mail', clientOrgId: org.id } })).data

    const inv = (await issue({ stage: 'Mailed stage', lines: stageLines }, job.id)).data
    const mail = await waitForMail(lead, on, `Invoice ${inv.number}`)
    expect(mail.text).toContain('£183.54') // the worked example's total, with tax
    expect(mail.attachments).toHaveLength(1)
    expect(mail.attachments[0]).toMatchObject({ name: `${inv.number}.pdf`, type: 'application/pdf' })
    const text = (await pdfText(mail.attachments[0]!.bytes)).join(' ')
    expect(text).toContain(`Invoice ${inv.number}`)
    expect(text).toContain('Egg-and-dart 150, Drawing room')
    expect(text).toContain('£183.54')

    // the contact with invoice mail off gets none; one mail per contact and invoice in the outbox
    const k = testDb()
    const queued = await k('mail_outbox').where({ kind: 'invoice' }).andWhere('dedupe_key', 'like', `invoice:${inv.id}:%`).select('to_email', 'attachment_name')
    expect(queued).toEqual([{ to_email: on, attachment_name: `${inv.number}.pdf` }])
    expect((await capturedMails(lead)).filter(m => m.to.includes(off))).toEqual([])

    // voided: nothing new is mailed
    expect((await call(`/api/invoices/${inv.id}/void`, { method: 'POST', cookie: lead, body: { reason: 'Wrong stage' } })).status).toBe(200)
    expect(await k('mail_outbox').where({ kind: 'invoice' }).andWhere('dedupe_key', 'like', `invoice:${inv.id}:%`).count('* as n').first()).toEqual({ n: '1' })

    // the contact turned on later gets the next invoice; the PDF is the same the lead downloads
    await call(`/api/contacts/${offContact.data.id}`, { method: 'PATCH', cookie: lead, body: { mailInvoices: true, version: offContact.data.version } })
    const next = (await issue({ stage: 'Mailed again', lines: tripLines }, job.id)).data
    const second = await waitForMail(lead, off, `Invoice ${next.number}`)
    expect((await pdfText(second.attachments[0]!.bytes)).join(' ')).toContain('£120.00')
  })
})
