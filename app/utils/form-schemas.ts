// The zod schemas of the forms on the tablet and client pages, loaded apart from the pages (a
// page that only shows things runs no zod while it loads). Each is fetched once and kept.
// A form asks for its schema when it opens. A tablet may have lost the Wi-Fi by then: with the
// service worker (https) the schema's file is in its cache like every script; without it, the
// form checks nothing in the browser and queues the step as it is. The server checks every step
// with the same schema and a refusal comes back through the outbox, so nothing is lost and
// nothing wrong is stored.
import type { floorActionSchema } from '#shared/utils/floor-schemas'
import type { finishingActionSchema } from '#shared/utils/finishing-schemas'
import type { sampleDecisionSchema } from '#shared/utils/job-schemas'

function once<T>(load: () => Promise<T>) {
  let p: Promise<T> | undefined
  return (): Promise<T | undefined> => (p ??= load().catch((err) => {
    p = undefined // offline: try again next time
    throw err
  })).catch(() => undefined)
}

export const loadFloorActionSchema: () => Promise<typeof floorActionSchema | undefined> = once(() => import('#shared/utils/floor-schemas').then(m => m.floorActionSchema))
export const loadFinishingActionSchema: () => Promise<typeof finishingActionSchema | undefined> = once(() => import('#shared/utils/finishing-schemas').then(m => m.finishingActionSchema))
export const loadSampleDecisionSchema: () => Promise<typeof sampleDecisionSchema | undefined> = once(() => import('#shared/utils/job-schemas').then(m => m.sampleDecisionSchema))
