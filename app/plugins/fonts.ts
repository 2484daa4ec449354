// Preloads the one font file the first screen of every page paints with (the regular weight,
// Latin subset), so the browser fetches it beside the stylesheet instead of discovering it only
// after the CSS is parsed and the text laid out. The other weights and subsets are fetched by
// the browser when text needs them (@font-face unicode-range and weight matching), and every
// face says font-display: swap (the @fontsource CSS), so text shows at once in the fallback
// font. Preloading more than what the first screen needs would compete with it for bandwidth
// (web.dev, "Preload key requests": preload only what is needed now).
import regular from '@fontsource/atkinson-hyperlegible-next/files/atkinson-hyperlegible-next-latin-400-normal.woff2?url'

export default defineNuxtPlugin(() => {
  useHead({
    // crossorigin: fonts are always fetched in CORS mode, and a preload without it is not reused
    link: [{ rel: 'preload', as: 'font', type: 'font/woff2', href: regular, crossorigin: '' }],
  })
})
