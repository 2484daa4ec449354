// On a database with no workshop, prints the first-run set-up code at boot
// (server/services/setup.ts). A database that is not reachable yet is left to the set-up page,
// which prints a code when it is opened.
import { ensureSetupCode } from '../services/setup'

export default defineNitroPlugin(() => {
  ensureSetupCode().catch(err => useLogger().error({ err: { message: err instanceof Error ? err.message : String(err) } }, 'setup code not printed'))
})
