import { mouldsRepo } from '../../repos/moulds'
// The moulds as CSV (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return sendCsv(event, 'setline-moulds.csv', mouldsRepo.exportQuery(useDb(), actor.workshopId), [
    { key: 'code', header: 'code' }, { key: 'casts', header: 'casts', number: true }, { key: 'material', header: 'material' },
    { key: 'bench', header: 'bench' }, { key: 'cavity_litres', header: 'cavity L', number: true }, { key: 'cast_length_m', header: 'cast length m', number: true },
    { key: 'prep_minutes', header: 'prep min', number: true }, { key: 'clean_minutes', header: 'clean min', number: true }, { key: 'max_dwell_minutes', header: 'max dwell min', number: true },
    { key: 'pulls', header: 'pulls', number: true }, { key: 'expected_pulls', header: 'expected pulls', number: true }, { key: 'state', header: 'state' },
    { key: 'state_reason', header: 'state reason' },
  ])
})
