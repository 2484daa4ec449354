// zod compiles object parsers with `new Function` when it may, and probes for that once, when
// the first object schema is built; under the page's Content Security Policy (no 'unsafe-eval',
// server/utils/security-headers.ts) the probe is refused and reported as a violation. jitless
// skips the probe and the compiling (zod docs, "z.config: jitless"); the forms' schemas are
// small, so nothing is lost. It is set when this module is evaluated, in the entry chunk: the
// router loads the first page (and builds its schemas) before plugins' setup functions run.
import { z } from 'zod'

z.config({ jitless: true })

export default defineNuxtPlugin({ name: 'zod-jitless' })
