// Invitations and password resets: the multi-step account use cases, each in one transaction.
//
// A one-time link (256-bit random, stored as SHA-256) is looked up before any password is
// hashed, so made-up links cost no scrypt; failures count per client address
// (resetConfirmAddress, inviteAcceptAddress in server/utils/rate-limit.ts) and a live link is
// never refused for others' failures (OWASP Forgot Password Cheat Sheet). Using a reset link
// ends the user's other open ones; disabling an account ends its open reset links. Whether an
// e-mail has an account is told only within the lead's own workshop: inviting another
// workshop's e-mail answers like a new address (accepting then fails for its owner).
import type { H3Event } from 'h3'
import type { Actor } from '../utils/auth'
import type { InvitationInfoDto, Role } from '#shared/types/auth'
import { workshopsRepo } from '../repos/workshops'
import { usersRepo } from '../repos/users'
import { invitationsRepo, resetsRepo } from '../repos/invitations'
import { clientOrgsRepo } from '../repos/client-orgs'
import { jobsRepo } from '../repos/jobs'

const INVITE_DAYS = 7
const RESET_MINUTES = 60

export async function inviteUser(actor: Actor, input: { email: string; role: Role; name?: string; clientOrgId?: number; jobId?: number }) {
  const db = useDb()
  // Whether an e-mail has an account is told only within the lead's own workshop: for another
  // workshop's e-mail the answer is the same as for a new address (the invitation is made and
  // mailed, and accepting it fails for its owner), so a lead cannot probe which addresses have
  // Setline accounts elsewhere (OWASP Authentication Cheat Sheet, "Authentication and Error
  // Messages": do not reveal whether an account exists).
  const existing = await usersRepo.byEmail(db, input.email)
  if (existing && existing.workshop_id === actor.workshopId) conflict('A user with this e-mail already exists')
  const { token, hash } = newLinkToken()
  const link = `${appEnv().APP_URL}/accept-invite?token=${token}`
  const invitation = await db.transaction(async (trx) => {
    if (input.clientOrgId) {
      if (!(await clientOrgsRepo.exists(trx, actor.workshopId, input.clientOrgId))) unprocessable([{ field: 'clientOrgId', message: 'is not a client organisation of this workshop' }])
    }
    if (input.jobId) {
      if (!(await jobsRepo.byId(trx, actor.workshopId, input.jobId))) unprocessable([{ field: 'jobId', message: 'is not a job of this workshop' }])
    }
    const workshop = await workshopsRepo.get(trx, actor.workshopId)
    if (!workshop) notFound('Workshop')
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

/** What an open invitation link is for (410 once it expired or was used). */
export async function invitationInfo(token: string): Promise<InvitationInfoDto> {
  const db = useDb()
  const inv = await invitationsRepo.openByTokenHash(db, hashLinkToken(token))
  if (!inv) throw createError({ statusCode: 410, message: 'This invitation link has expired or was already used' })
  const workshop = await workshopsRepo.get(db, inv.workshop_id)
  if (!workshop) notFound('Workshop')
  return { email: inv.email, name: inv.name, role: inv.role, workshop: workshop.name }
}

const INVITATION_GONE = 'This invitation link has expired or was already used; ask your workshop lead for a new one'
const ACCOUNT_EXISTS = 'An account with this e-mail already exists; sign in instead'

/**
 * Accepts an invitation. The link is looked up before the password is hashed, so a made-up
 * or used link costs a lookup, not a scrypt (which is slow and memory-hard on purpose), and
 * counts against the address (`inviteAcceptAddress`: a 429 once too many); a live link is
 * never refused for others' failures. The transaction checks the link again, as it may have
 * been used while the password was hashed.
 */
export async function acceptInvitation(event: H3Event, input: { token: string; name: string; password: string }) {
  const db = useDb()
  const tokenHash = hashLinkToken(input.token)
  const found = await invitationsRepo.openByTokenHash(db, tokenHash)
  if (!found) {
    await spendAttempt('inviteAcceptAddress', clientAddress(event), event)
    throw createError({ statusCode: 410, message: INVITATION_GONE })
  }
  if (await usersRepo.byEmail(db, found.email)) conflict(ACCOUNT_EXISTS)
  const passwordHash = await hashNewPassword(input.password)
  return db.transaction(async (trx) => {
    const inv = await invitationsRepo.openByTokenHash(trx, tokenHash)
    if (!inv) throw createError({ statusCode: 410, message: INVITATION_GONE })
    if (await usersRepo.byEmail(trx, inv.email)) conflict(ACCOUNT_EXISTS)
    const user = await usersRepo.insert(trx, {
      workshop_id: inv.workshop_id, email: inv.email, name: input.name, role: inv.role,
      client_org_id: inv.client_org_id, password_hash: passwordHash,
    })
    if (inv.job_id) await jobsRepo.addMember(trx, inv.workshop_id, inv.job_id, user.id)
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

const RESET_GONE = 'This reset link has expired or was already used; ask for a new one'

/**
 * Sets a new password from a reset link. As with invitations, the link is looked up before the
 * password is hashed (a made-up link costs no scrypt and counts against the address,
 * `resetConfirmAddress`), and checked again in the transaction that uses it. Using one link
 * ends the user's other open links: one reset, one working link (OWASP Forgot Password Cheat
 * Sheet: tokens single-use and invalidated once the password is changed).
 */
export async function confirmPasswordReset(event: H3Event, input: { token: string; password: string }) {
  const db = useDb()
  const tokenHash = hashLinkToken(input.token)
  if (!(await resetsRepo.openByTokenHash(db, tokenHash))) {
    await spendAttempt('resetConfirmAddress', clientAddress(event), event)
    throw createError({ statusCode: 410, message: RESET_GONE })
  }
  const passwordHash = await hashNewPassword(input.password)
  return db.transaction(async (trx) => {
    const reset = await resetsRepo.openByTokenHash(trx, tokenHash)
    if (!reset) throw createError({ statusCode: 410, message: RESET_GONE })
    if (await resetsRepo.markUsed(trx, reset.id) !== 1) conflict('This reset link was just used')
    await resetsRepo.voidOpen(trx, reset.workshop_id, reset.user_id)
    await usersRepo.setPassword(trx, reset.workshop_id, reset.user_id, passwordHash)
    return usersRepo.byId(trx, reset.workshop_id, reset.user_id)
  })
}

/**
 * Disables or re-enables a user of the workshop (both end their sessions). Disabling also ends
 * their open reset links, so a link mailed before cannot bring the account back in, even once
 * re-enabled. Invitations the user sent stay open: they were the workshop's decision.
 */
export async function setUserDisabled(workshopId: number, id: number, disabled: boolean) {
  return useDb().transaction(async (trx) => {
    const row = await usersRepo.setDisabled(trx, workshopId, id, disabled)
    if (row && disabled) await resetsRepo.voidOpen(trx, workshopId, id)
    return row
  })
}
