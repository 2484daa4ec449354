// What an invitation link is for, so the accept page can greet the person (public).
import { invitationInfo } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  const { token } = validQuery(event, tokenQuerySchema)
  return invitationInfo(token)
})
