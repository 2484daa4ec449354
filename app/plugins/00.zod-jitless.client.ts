// zod compiles object parsers with `new Function` when it may, and probes for that once; under
// the page's Content Security Policy (no 'unsafe-eval', server/utils/security-headers.ts) the
// probe is refused and reported as a violation. jitless skips the probe and the compiling
// (zod docs, "z.config: jitless"); the forms' schemas are small, so nothing is lost.
import { z } from 'zod'

export default defineNuxtPlugin({
  name: 'zod-jitless',
  enforce: 'pre',
  setup() {
    z.config({ jitless: true })
  },
})
