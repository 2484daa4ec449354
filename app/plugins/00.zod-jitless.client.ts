// zod compiles object parsers with `new Function` when it may, and probes for that once, when
// the first object schema is built; under the page's Content Security Policy (no 'unsafe-eval',
// server/utils/security-headers.ts) the probe is refused and reported as a violation. jitless
// skips the probe and the compiling (zod docs, "z.config: jitless"); the forms' schemas are
// small, so nothing is lost. It must be set before the first page builds its schemas, and the
// router loads the first page before plugins' setup functions run, so it is set when this module
// is evaluated, in the entry chunk. zod keeps its settings on globalThis.__zod_globalConfig and
// adopts an object already there (zod/v4/core/core.js, what z.config writes to), so the entry
// sets the flag there rather than importing zod: the forms' pages bring zod in their own chunks.
const zodConfig = globalThis as { __zod_globalConfig?: { jitless?: boolean } }
// mutated, never replaced: zod binds the object it finds when it is first evaluated
;(zodConfig.__zod_globalConfig ??= {}).jitless = true

export default defineNuxtPlugin({ name: 'zod-jitless' })
