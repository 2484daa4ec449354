// The zod schemas of the forms on the tablet and client pages, loaded apart from the pages (a
// page that only shows things runs no zod while it loads); the browser keeps a module once fetched.
// A form asks for its schema when it opens. A tablet may have lost the Wi-Fi by then: with the
// service worker (https) the schema's file is in its cache like every script; without it, the
// form checks nothing in the browser and queues the step as it is. The server checks every step
// with the same schema and a refusal comes back through the outbox, so nothing is lost and
// nothing wrong is stored.
/** The schema, or undefined when its file cannot be fetched (the form then checks nothing). */
const orNothing = <T>(load: Promise<T>) => load.catch(() => undefined)

export const loadFloorActionSchema = () => orNothing(import('#shared/utils/floor-schemas').then(m => m.floorActionSchema))
export const loadFinishingActionSchema = () => orNothing(import('#shared/utils/finishing-schemas').then(m => m.finishingActionSchema))
export const loadSampleDecisionSchema = () => orNothing(import('#shared/utils/job-schemas').then(m => m.sampleDecisionSchema))
