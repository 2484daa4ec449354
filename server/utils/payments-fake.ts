// A local fake of the hosted payment service, for the demo and the tests: the part of its HTTP
// API Setline's calls use (checkout sessions, refunds), a checkout page of its own that says it
// takes no money, and webhooks signed with the webhook secret the way the service signs them
// (the official SDK's own test-header helper), posted to Setline's webhook route. It listens on
// the loopback address only and keeps everything in memory.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http'
import { randomBytes } from 'node:crypto'
import Stripe from 'stripe'

interface FakeSession {
  id: string
  object: 'checkout.session'
  status: 'open' | 'complete' | 'expired'
  payment_status: 'unpaid' | 'paid'
  amount_total: number
  currency: string
  metadata: Record<string, string>
  client_reference_id: string | null
  success_url: string
  cancel_url: string
  payment_intent: string | null
  url: string
}

export interface SentEvent { id: string; type: string; payload: string; signature: string; status: number }

export interface PaymentsFake {
  port: number
  baseUrl: string
  /** Every webhook the fake sent, oldest first (for the tests' replay check). */
  events: SentEvent[]
  close(): Promise<void>
}

const id = (prefix: string) => `${prefix}_${randomBytes(12).toString('hex')}`

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = []
  let size = 0
  for await (const c of req) {
    size += (c as Buffer).length
    if (size > 64 * 1024) throw new Error('too large')
    chunks.push(c as Buffer)
  }
  return Buffer.concat(chunks).toString('utf8')
}

const escape = (s: string) => s.replace(/[&<>"']/g, c => `&#${c.charCodeAt(0)};`)

export async function startPaymentsFake(opts: { port: number; webhookUrl: string; webhookSecret: string; host?: string }): Promise<PaymentsFake> {
  const host = opts.host ?? '127.0.0.1'
  const sessions = new Map<string, FakeSession>()
  const events: SentEvent[] = []
  const signer = new Stripe('sk_test_fake_signer')
  let baseUrl = ''

  async function sendEvent(type: string, object: unknown) {
    const event = { id: id('evt'), object: 'event', type, created: Math.floor(Date.now() / 1000), data: { object } }
    const payload = JSON.stringify(event)
    const signature = signer.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret })
    let status = 0
    try {
      const res = await fetch(opts.webhookUrl, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': signature }, body: payload })
      status = res.status
      await res.arrayBuffer()
    }
    catch {
      status = 0
    }
    events.push({ id: event.id, type, payload, signature, status })
  }

  function json(res: ServerResponse, status: number, body: unknown) {
    res.writeHead(status, { 'content-type': 'application/json' })
    res.end(JSON.stringify(body))
  }

  async function handle(req: IncomingMessage, res: ServerResponse) {
    const url = new URL(req.url ?? '/', baseUrl)
    const path = url.pathname
    if (req.method === 'POST' && path === '/v1/checkout/sessions') {
      const form = new URLSearchParams(await readBody(req))
      const unit = Number(form.get('line_items[0][price_data][unit_amount]'))
      const quantity = Number(form.get('line_items[0][quantity]') ?? '1')
      const currency = form.get('line_items[0][price_data][currency]') ?? ''
      if (!Number.isInteger(unit) || unit <= 0 || !currency) return json(res, 400, { error: { message: 'line_items[0] needs a unit_amount and currency' } })
      const metadata: Record<string, string> = {}
      for (const [k, v] of form) {
        const m = /^metadata\[(.+)\]$/.exec(k)
        if (m) metadata[m[1]!] = v
      }
      const session: FakeSession = {
        id: id('cs_test'), object: 'checkout.session', status: 'open', payment_status: 'unpaid', amount_total: unit * quantity,
        currency: currency.toLowerCase(), metadata, client_reference_id: form.get('client_reference_id'),
        success_url: form.get('success_url') ?? '', cancel_url: form.get('cancel_url') ?? '', payment_intent: null, url: '',
      }
      session.url = `${baseUrl}/pay/${session.id}`
      sessions.set(session.id, session)
      return json(res, 200, session)
    }
    const get = /^\/v1\/checkout\/sessions\/([\w]+)$/.exec(path)
    if (req.method === 'GET' && get) {
      const s = sessions.get(get[1]!)
      return s ? json(res, 200, s) : json(res, 404, { error: { message: 'No such checkout session' } })
    }
    if (req.method === 'POST' && path === '/v1/refunds') {
      const form = new URLSearchParams(await readBody(req))
      const intent = form.get('payment_intent')
      const s = [...sessions.values()].find(x => x.payment_intent && x.payment_intent === intent)
      if (!s) return json(res, 404, { error: { message: 'No such payment_intent' } })
      const refund = { id: id('re'), object: 'refund', amount: s.amount_total, currency: s.currency, payment_intent: intent, status: 'succeeded' }
      await sendEvent('charge.refunded', { id: id('ch'), object: 'charge', payment_intent: intent, amount: s.amount_total, amount_refunded: s.amount_total, currency: s.currency, metadata: s.metadata, refunded: true })
      return json(res, 200, refund)
    }
    const page = /^\/pay\/([\w]+)(?:\/(complete|cancel))?$/.exec(path)
    const s = page ? sessions.get(page[1]!) : undefined
    if (page && !s) {
      res.writeHead(404, { 'content-type': 'text/plain' })
      return res.end('No such payment')
    }
    if (s && req.method === 'GET' && !page![2]) {
      const amount = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
      return res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>Test payment</title></head>
<body style="font-family:sans-serif;max-width:32rem;margin:2rem auto;padding:0 1rem">
<h1>Test payment service</h1><p><strong>No real money is taken here.</strong> This page stands in for the hosted payment service in a demo or a test.</p>
<p>Amount: <strong>${escape(amount)}</strong></p>
<form method="post" action="/pay/${s.id}/complete"><button type="submit" style="min-height:44px;padding:0 1rem">Pay ${escape(amount)}</button></form>
<form method="post" action="/pay/${s.id}/cancel" style="margin-top:1rem"><button type="submit" style="min-height:44px;padding:0 1rem">Cancel</button></form>
</body></html>`)
    }
    if (s && req.method === 'POST' && page![2] === 'complete') {
      await readBody(req)
      if (s.status === 'open') {
        s.status = 'complete'
        s.payment_status = 'paid'
        s.payment_intent = id('pi')
        await sendEvent('checkout.session.completed', s)
      }
      res.writeHead(303, { location: s.success_url })
      return res.end()
    }
    if (s && req.method === 'POST' && page![2] === 'cancel') {
      await readBody(req)
      res.writeHead(303, { location: s.cancel_url })
      return res.end()
    }
    json(res, 404, { error: { message: 'Not a route of the payments fake' } })
  }

  const server: Server = createServer((req, res) => {
    handle(req, res).catch(() => json(res, 400, { error: { message: 'Bad request' } }))
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, host, () => resolve())
  })
  const port = (server.address() as { port: number }).port
  baseUrl = `http://${host}:${port}`
  return {
    port, baseUrl, events,
    close: () => new Promise<void>(resolve => server.close(() => resolve())),
  }
}
