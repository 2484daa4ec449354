// Liveness and database reachability; public, reveals nothing.
export default defineEventHandler(async () => {
  await useDb().raw('select 1')
  return { ok: true }
})
