// Every write request drops its workshop's kept answers as it answers (server/utils/read-cache.ts),
// here and on the other instances: the next read sees the write even when no live event follows
// it. The workshop is the one requireRole found; a write without a session (signing in, a
// payment service's webhook, a link from a mail) drops every workshop's, which costs a read.
const READS = new Set(['GET', 'HEAD', 'OPTIONS'])

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('beforeResponse', (event) => {
    if (READS.has(event.method)) return
    readsChanged(event.context.workshopId)
  })
  // a write that failed part way may still have committed something (a row before the fault)
  nitroApp.hooks.hook('error', (_error, { event }) => {
    if (event && !READS.has(event.method)) readsChanged(event.context.workshopId)
  })
})
