// The signed-in user as the server sees them now (role and name from the database).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event)
  const workshop = await useDb()('workshops').select('name', 'units', 'timezone').where({ id: actor.workshopId }).first()
  return { id: actor.id, name: actor.name, email: actor.email, role: actor.role, home: ROLE_HOME[actor.role], workshop }
})
