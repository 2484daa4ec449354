import { lotsRepo } from '../../repos/plaster-lots'
// The lots as CSV (lead). Stock on hand is on the page; the file lists what was received.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return sendCsv(event, 'setline-lots.csv', lotsRepo.exportQuery(useDb(), actor.workshopId), [
    { key: 'lot_code', header: 'lot code' }, { key: 'grade', header: 'grade' }, { key: 'bags_received', header: 'bags received', number: true },
    { key: 'bag_kg', header: 'bag kg', number: true }, { key: 'received_on', header: 'received on' }, { key: 'use_by', header: 'use by' },
    { key: 'archived', header: 'archived' }, { key: 'notes', header: 'notes' },
  ])
})
