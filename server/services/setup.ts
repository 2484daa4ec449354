// First-run set-up: a Setline started on a database with no workshop (npm start with
// SETLINE_DEMO=0, or a production start) prints a one-time set-up code on its console. Whoever
// can read that console — the person who installed it — types the code on /setup with the
// workshop's settings and their own account, and becomes its first lead.
//
// Rules: the code is 12 symbols from SETUP_CODE_ALPHABET (about 60 bits, crypto random), only
// its SHA-256 is stored, it works once and for SETUP_CODE_MINUTES; wrong codes are counted per
// address (server/utils/rate-limit.ts, setupAddress). When no live code is left (expired), the
// next visit to the set-up page prints a new one. Once a workshop exists the page and its
// routes answer 404 and every code left is spent. Several instances may each print a code;
// any of them works, and an advisory lock lets only one set-up through.
import { randomInt } from 'node:crypto'
import type { H3Event } from 'h3'
import { setupCodesRepo } from '../repos/setup-codes'
import { workshopsRepo } from '../repos/workshops'
import { usersRepo } from '../repos/users'
import { timezonesRepo } from '../repos/timezones'
import { SETUP_CODE_ALPHABET, type SetupInput } from '#shared/utils/setup-schemas'

const CODE_GONE = 'Set-up code is wrong, used or expired: use the newest code printed on the server console'
// the same key for every instance: pg_advisory_xact_lock takes a bigint
const SETUP_LOCK = 0x5e71_5e7

function newCode() {
  let code = ''
  for (let i = 0; i < 12; i++) code += SETUP_CODE_ALPHABET[randomInt(SETUP_CODE_ALPHABET.length)]
  return code
}

/** 404 once a workshop exists: the set-up is gone. */
export async function assertSetupOpen() {
  if (await workshopsRepo.any(useDb())) throw createError({ statusCode: 404, message: 'Page not found' })
}

/**
 * Prints a new set-up code when the database has no workshop and no live code (at boot, and
 * when the set-up page is opened after the last code expired). Returns whether it printed one.
 */
export async function ensureSetupCode(): Promise<boolean> {
  const db = useDb()
  if (await workshopsRepo.any(db) || await setupCodesRepo.anyLive(db)) return false
  const code = newCode()
  const minutes = appEnv().SETUP_CODE_MINUTES
  await setupCodesRepo.insert(db, hashLinkToken(code), minutes)
  const shown = `${code.slice(0, 4)}-${code.slice(4, 8)}-${code.slice(8)}`
  console.log([
    '',
    'setline: this database has no workshop yet.',
    `setline: open ${appEnv().APP_URL}/setup and enter the set-up code ${shown}`,
    `setline: (it works once, for ${minutes} minutes; when it has expired, opening /setup prints a new one here)`,
    '',
  ].join('\n'))
  return true
}

/** Creates the workshop and its first lead, spending the code; returns the lead's user row. */
export async function setUpWorkshop(event: H3Event, input: SetupInput) {
  const db = useDb()
  await assertSetupOpen()
  const timezone = await timezonesRepo.canonical(db, input.timezone)
  if (!timezone) unprocessable([{ field: 'timezone', message: `Timezone ${input.timezone} is not one the database knows: choose a zone such as Europe/London` }])
  const codeHash = hashLinkToken(input.code)
  // a wrong code costs a lookup and counts against the address, before the password is hashed
  if (!(await setupCodesRepo.isLive(db, codeHash))) {
    await spendAttempt('setupAddress', clientAddress(event), event)
    unprocessable([{ field: 'code', message: CODE_GONE }])
  }
  const passwordHash = await hashNewPassword(input.leadPassword)
  return db.transaction(async (trx) => {
    await trx.raw('SELECT pg_advisory_xact_lock(?)', [SETUP_LOCK])
    if (await workshopsRepo.any(trx)) throw createError({ statusCode: 404, message: 'Page not found' })
    if (!(await setupCodesRepo.lockLive(trx, codeHash))) unprocessable([{ field: 'code', message: CODE_GONE }])
    if (await usersRepo.byEmail(trx, input.leadEmail)) conflict('An account with this e-mail already exists')
    const ws = await workshopsRepo.insert(trx, {
      name: input.name, units: input.units, timezone, shift_start: input.shiftStart, shift_end: input.shiftEnd, shift_breaks: input.shiftBreaks,
      working_days: [...new Set(input.workingDays)].sort(), default_shop_temp_c: input.defaultShopTempC, default_humidity_pct: input.defaultHumidityPct,
      ...(input.locale ? { locale: input.locale } : {}),
      ...(input.crateMaxKg !== undefined ? { crate_max_kg: input.crateMaxKg } : {}),
    })
    const lead = await usersRepo.insert(trx, { workshop_id: ws.id, email: input.leadEmail, name: input.leadName, role: 'lead', password_hash: passwordHash })
    await setupCodesRepo.useAll(trx)
    return lead
  })
}
