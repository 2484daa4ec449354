import { setUpWorkshop } from '../../services/setup'
// Public, only while no workshop exists (404 after): creates the workshop and its first lead
// with the one-time code from the server console, then signs the lead in.
export default defineEventHandler(async (event) => {
  const input = await validBody(event, setupSchema)
  const lead = await setUpWorkshop(event, input)
  await startSession(event, lead)
  return { id: lead.id, name: lead.name, role: lead.role, home: ROLE_HOME[lead.role] }
})
