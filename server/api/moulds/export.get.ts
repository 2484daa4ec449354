import { mouldsRepo } from '../../repos/moulds'
// The moulds as CSV (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return sendCsv(event, 'setline-moulds.csv', mouldsRepo.exportQuery(useDb(), actor.workshopId), [
    { key: 'code', header: 'code' }, { key: 'casts', header: 'casts' }, { key: 'material', header: 'material' },
    { key: 'bench', header: 'bench' }, { key: 'cavity_litres', header: 'cavity L' }, { key: 'cast_length_m', header: 'cast length m' },
    { key: 'prep_minutes', header: 'prep min' }, { key: 'clean_minutes', header: 'clean min' }, { key: 'max_dwell_minutes', header: 'max dwell min' },
    { key: 'pulls', header: 'pulls' }, { key: 'expected_pulls', header: 'expected pulls' }, { key: 'state', header: 'state' },
    { key: 'state_reason', header: 'state reason' },
  ])
})
