// Starts the local payments fake when PAYMENTS_FAKE=1 (the demo and the tests).
import { startPaymentsFake } from '../utils/payments-fake'
import { FAKE_WEBHOOK_SECRET, currentPaymentsFake, setCurrentPaymentsFake } from '../utils/payments'

export default defineNitroPlugin(async (nitro) => {
  const env = appEnv()
  if (!env.PAYMENTS_FAKE) return
  const fake = await startPaymentsFake({ port: env.PAYMENTS_FAKE_PORT, webhookUrl: `${env.APP_URL}/api/payments/webhook`, webhookSecret: FAKE_WEBHOOK_SECRET })
  setCurrentPaymentsFake(fake)
  useLogger().info({ url: fake.baseUrl }, 'payments fake listening (no real money)')
  nitro.hooks.hook('close', async () => {
    await currentPaymentsFake()?.close()
    setCurrentPaymentsFake(undefined)
  })
})
