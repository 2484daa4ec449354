// Invitations and password resets: the multi-step account use cases, each in one transaction.
import type { Actor } from '../utils/auth'
import type { Role } from '#shared/types/auth'
import { usersRepo } from '../repos/users'
import { invitationsRepo, resetsRepo } from '../repos/invitations'

const INVITE_DAYS = 7
const RESET_MINUTES = 60

export async function inviteUser(actor: Actor, input: { email: string; role: Role; name?: string; clientOrgId?: number; jobId?: number }) {
  const db = useDb()
  const existing = await usersRepo.byEmail(db, input.email)
  if (existing) conflict('A user with this e-mail already exists')
  const { token, hash } = newLinkToken()
  const link = `${appEnv().APP_URL}/accept-invite?token=${token}`
  const invitation = await db.transaction(async (trx) => {
    if (input.clientOrgId) {
      const org = await trx('client_orgs').where({ workshop_id: actor.workshopId, id: input.clientOrgId }).first('id')
      if (!org) unprocessable([{ field: 'clientOrgId', message: 'is not a client organisation of this workshop' }])
    }
    if (input.jobId) {
      const job = await trx('jobs').where({ workshop_id: actor.workshopId, id: input.jobId }).first('id')
      if (!job) unprocessable([{ field: 'jobId', message: 'is not a job of this workshop' }])
    }
    const workshop = await trx('workshops').where({ id: actor.workshopId }).first('name')
    const row = await invitationsRepo.insert(trx, {
      workshop_id: actor.workshopId, email: input.email, name: input.name ?? null, role: input.role,
      client_org_id: input.clientOrgId ?? null, job_id: input.jobId ?? null, token_hash: hash,
      invited_by: actor.id, expires_at: new Date(Date.now() + INVITE_DAYS * 86_400_000),
    })
    await queueMail(trx, {
      workshopId: actor.workshopId, to: input.email, kind: 'invitation',
      subject: `${actor.name} invited you to ${workshop.name} on Setline`,
      text: [
        `Hello${input.name ? ` ${input.name}` : ''},`, '',
        `${actor.name} has invited you to join ${workshop.name} on Setline as ${input.role}.`,
        `Open this link to choose your password (it works once, for ${INVITE_DAYS} days):`, link, '',
        'If you did not expect this, you can ignore this message.',
      ].join('\n'),
    })
    return row
  })
  void deliverDueMail().catch(() => undefined)
  return invitation
}

export async function acceptInvitation(input: { token: string; name: string; password: string }) {
  const passwordHash = await hashNewPassword(input.password)
  const db = useDb()
  return db.transaction(async (trx) => {
    const inv = await invitationsRepo.openByTokenHash(trx, hashLinkToken(input.token))
    if (!inv) throw createError({ statusCode: 410, message: 'This invitation link has expired or was already used; ask your workshop lead for a new one' })
    if (await usersRepo.byEmail(trx, inv.email)) conflict('An account with this e-mail already exists; sign in instead')
    const user = await usersRepo.insert(trx, {
      workshop_id: inv.workshop_id, email: inv.email, name: input.name, role: inv.role,
      client_org_id: inv.client_org_id, password_hash: passwordHash,
    })
    if (inv.job_id) await trx('job_members').insert({ workshop_id: inv.workshop_id, job_id: inv.job_id, user_id: user.id }).onConflict().ignore()
    const marked = await invitationsRepo.markAccepted(trx, inv.id, user.id)
    if (marked !== 1) conflict('This invitation was just used')
    return user
  })
}

/** Always succeeds from the caller's view, so the answer does not tell which e-mails exist. */
export async function requestPasswordReset(email: string) {
  const db = useDb()
  const user = await usersRepo.byEmail(db, email)
  if (!user || user.disabled_at) return
  const { token, hash } = newLinkToken()
  await db.transaction(async (trx) => {
    await resetsRepo.insert(trx, { workshop_id: user.workshop_id, user_id: user.id, token_hash: hash, expires_at: new Date(Date.now() + RESET_MINUTES * 60_000) })
    await queueMail(trx, {
      workshopId: user.workshop_id, userId: user.id, to: user.email, kind: 'password_reset',
      subject: 'Reset your Setline password',
      text: [
        `Hello ${user.name},`, '',
        `Someone asked to reset the password of your Setline account. The link below works once, for ${RESET_MINUTES} minutes:`,
        `${appEnv().APP_URL}/reset-password?token=${token}`, '',
        'If it was not you, ignore this message: your password stays as it is.',
      ].join('\n'),
    })
  })
  void deliverDueMail().catch(() => undefined)
}

export async function confirmPasswordReset(input: { token: string; password: string }) {
  const passwordHash = await hashNewPassword(input.password)
  return useDb().transaction(async (trx) => {
    const reset = await resetsRepo.openByTokenHash(trx, hashLinkToken(input.token))
    if (!reset) throw createError({ statusCode: 410, message: 'This reset link has expired or was already used; ask for a new one' })
    if (await resetsRepo.markUsed(trx, reset.id) !== 1) conflict('This reset link was just used')
    await usersRepo.setPassword(trx, reset.workshop_id, reset.user_id, passwordHash)
    return usersRepo.byId(trx, reset.workshop_id, reset.user_id)
  })
}
