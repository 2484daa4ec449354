// A made-up reset or invitation link costs a lookup, never a password hash (scrypt at 128 MiB
// is slow on purpose), and counts against the address. The service runs here with a database
// that knows no link and with the server's helpers stubbed, so the order is what is tested.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createError } from 'h3'
import type { H3Event } from 'h3'

// Loaded by a path held in a variable: the service leans on Nitro's auto-imports, which the
// tools' typecheck (tsconfig.tools.json) does not know, so it must not follow this import.
const servicePath = '../../server/services/accounts'
const { acceptInvitation, confirmPasswordReset } = await import(servicePath) as {
  acceptInvitation(event: H3Event, input: { token: string; name: string; password: string }): Promise<unknown>
  confirmPasswordReset(event: H3Event, input: { token: string; password: string }): Promise<unknown>
}

/** A knex stand-in whose every query finds nothing. */
function emptyDb() {
  const query: unknown = new Proxy(() => undefined, {
    get: (_, prop) => (prop === 'first' ? async () => undefined : prop === 'then' ? undefined : () => query),
  })
  const db = Object.assign(() => query, {
    fn: { now: () => 'now()' },
    transaction: async (fn: (trx: unknown) => unknown) => fn(db),
  })
  return db
}

const hashNewPassword = vi.fn(async () => 'hash')
const spendAttempt = vi.fn(async () => undefined)

beforeEach(() => {
  vi.stubGlobal('useDb', emptyDb)
  vi.stubGlobal('createError', createError)
  vi.stubGlobal('hashLinkToken', (t: string) => `sha256:${t}`)
  vi.stubGlobal('clientAddress', () => '203.0.113.9')
  vi.stubGlobal('hashNewPassword', hashNewPassword)
  vi.stubGlobal('spendAttempt', spendAttempt)
  vi.stubGlobal('conflict', (message: string) => {
    throw createError({ statusCode: 409, message })
  })
})
afterEach(() => {
  vi.unstubAllGlobals()
  vi.clearAllMocks()
})

const event = {} as H3Event
const token = 'made-up-token-made-up-token-made-up-00'

describe('one-time links that do not exist', () => {
  it('a reset link: 410, counted for the address, and no password hashed', async () => {
    await expect(confirmPasswordReset(event, { token, password: 'a-long-enough-password' })).rejects.toMatchObject({ statusCode: 410 })
    expect(hashNewPassword).not.toHaveBeenCalled()
    expect(spendAttempt).toHaveBeenCalledWith('resetConfirmAddress', '203.0.113.9', event)
  })

  it('an invitation link: 410, counted for the address, and no password hashed', async () => {
    await expect(acceptInvitation(event, { token, name: 'Nobody', password: 'a-long-enough-password' })).rejects.toMatchObject({ statusCode: 410 })
    expect(hashNewPassword).not.toHaveBeenCalled()
    expect(spendAttempt).toHaveBeenCalledWith('inviteAcceptAddress', '203.0.113.9', event)
  })
})
