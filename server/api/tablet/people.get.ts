// The shared tablet's picker (device cookie, no session needed): the tablet's name, its
// workshop and the enabled casters and finishers who have a PIN. 401 without a live device cookie.
import { usersRepo } from '../../repos/users'
import { workshopsRepo } from '../../repos/workshops'

export default defineEventHandler(async (event) => {
  const tablet = await requireTablet(event)
  const db = useDb()
  const [workshop, people] = await Promise.all([workshopsRepo.get(db, tablet.workshop_id), usersRepo.tabletPeople(db, tablet.workshop_id, TABLET_ROLES)])
  if (!workshop) notFound('Workshop')
  return { tablet: { id: tablet.id, name: tablet.name }, workshop: workshop.name, people }
})
