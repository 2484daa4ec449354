// The hosted payment service through its official SDK (stripe). Card details are typed on the
// service's own checkout page, never in Setline; Setline keeps the session and payment
// references. PAYMENTS_FAKE=1 points the SDK at the local fake (server/utils/payments-fake.ts)
// with its fixed test keys; otherwise PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET set up the
// real service, and with neither, card payments are off (leads record payments themselves).
import Stripe from 'stripe'
import type { PaymentsFake } from './payments-fake'

export const FAKE_SECRET_KEY = 'sk_test_setline_fake'
export const FAKE_WEBHOOK_SECRET = 'whsec_setline_fake'

let fake: PaymentsFake | undefined
let client: Stripe | undefined

export function setCurrentPaymentsFake(f: PaymentsFake | undefined) {
  fake = f
  client = undefined
}
export const currentPaymentsFake = () => fake

/** The SDK client, or undefined when card payments are not set up. */
export function paymentsClient(): Stripe | undefined {
  if (client) return client
  const env = appEnv()
  if (env.PAYMENTS_FAKE && fake) {
    client = new Stripe(FAKE_SECRET_KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 })
  }
  else if (env.PAYMENTS_SECRET_KEY) {
    client = new Stripe(env.PAYMENTS_SECRET_KEY, { maxNetworkRetries: 2 })
  }
  return client
}

export function webhookSecret(): string | undefined {
  const env = appEnv()
  return env.PAYMENTS_FAKE ? FAKE_WEBHOOK_SECRET : env.PAYMENTS_WEBHOOK_SECRET
}

/** The event, when the signature over the raw body is the service's; undefined otherwise. */
export function verifiedEvent(raw: string, signature: string | undefined): Stripe.Event | undefined {
  const secret = webhookSecret()
  const sdk = paymentsClient()
  if (!secret || !sdk || !signature) return undefined
  try {
    return sdk.webhooks.constructEvent(raw, signature, secret)
  }
  catch {
    return undefined
  }
}
