// The shared tablet's picker (device cookie, no session needed): the tablet's name, its
// workshop and the enabled casters and finishers who have a PIN. 401 without a live device cookie.
import { usersRepo } from '../../repos/users'

export default defineEventHandler(async (event) => {
  const tablet = await requireTablet(event)
  const db = useDb()
  const workshop = await db('workshops').where({ id: tablet.workshop_id }).first('name')
  const people = await usersRepo.tabletPeople(db, tablet.workshop_id, TABLET_ROLES)
  return { tablet: { id: tablet.id, name: tablet.name }, workshop: workshop.name as string, people }
})
