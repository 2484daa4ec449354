import { invitationsRepo } from '../../repos/invitations'
// What an invitation link is for, so the accept page can greet the person (public).
export default defineEventHandler(async (event) => {
  const { token } = validQuery(event, tokenQuerySchema)
  const db = useDb()
  const inv = await invitationsRepo.openByTokenHash(db, hashLinkToken(token))
  if (!inv) throw createError({ statusCode: 410, message: 'This invitation link has expired or was already used' })
  const workshop = await db('workshops').where({ id: inv.workshop_id }).first('name')
  return { email: inv.email, name: inv.name, role: inv.role, workshop: workshop.name }
})
