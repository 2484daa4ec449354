// The moulds as CSV (lead), in the words and units the Moulds page shows: material and state
// by their labels, cavity and cast length in the workshop's units with the unit in the header;
// cavities, cast (solid or fibrous), face area (m² or ft²) and shell thickness (mm or in).
import { mouldsRepo } from '../../repos/moulds'
import { workshopsRepo } from '../../repos/workshops'
import { UNIT_LABELS, displayNumber } from '#shared/utils/units-display'

interface MouldExportRow {
  material: string
  state: string
  cavity_litres: string | number | null
  cast_length_m: string | number | null
  surface_area_m2: string | number | null
  shell_thickness_mm: string | number | null
  [k: string]: unknown
}

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const db = useDb()
  const ws = await workshopsRepo.get(db, actor.workshopId)
  const u = ws?.units ?? 'metric'
  const label = UNIT_LABELS[u]
  const rows: MouldExportRow[] = await mouldsRepo.exportQuery(db, actor.workshopId)
  const figure = (v: string | number | null, q: 'volume' | 'length' | 'area' | 'thickness', digits: number) => (v === null ? null : displayNumber(q, Number(v), u, digits))
  return sendCsvRows(event, 'setline-moulds.csv', rows.map(r => ({
    ...r,
    material: MOULD_MATERIAL_LABELS[r.material as keyof typeof MOULD_MATERIAL_LABELS] ?? r.material,
    state: MOULD_STATE_LABELS[r.state as keyof typeof MOULD_STATE_LABELS] ?? r.state,
    cavity_litres: figure(r.cavity_litres, 'volume', 3),
    cast_length_m: figure(r.cast_length_m, 'length', u === 'imperial' ? 1 : 3),
    surface_area_m2: figure(r.surface_area_m2, 'area', 3),
    shell_thickness_mm: figure(r.shell_thickness_mm, 'thickness', u === 'imperial' ? 3 : 1),
  })), [
    { key: 'code', header: 'code' }, { key: 'casts', header: 'casts' }, { key: 'material', header: 'material' },
    { key: 'bench', header: 'bench' }, { key: 'cavity_litres', header: `cavity (${label.volume})`, number: true }, { key: 'cast_length_m', header: `cast length (${label.length})`, number: true },
    { key: 'prep_minutes', header: 'prep (min)', number: true }, { key: 'clean_minutes', header: 'clean-out (min)', number: true }, { key: 'max_dwell_minutes', header: 'maximum dwell (min)', number: true },
    { key: 'pulls', header: 'pulls', number: true }, { key: 'expected_pulls', header: 'expected pulls', number: true }, { key: 'state', header: 'state' },
    { key: 'state_reason', header: 'state reason' },
    { key: 'cavities', header: 'cavities', number: true }, { key: 'cast_type', header: 'cast' },
    { key: 'surface_area_m2', header: `face area (${label.area})`, number: true }, { key: 'shell_thickness_mm', header: `shell thickness (${label.thickness})`, number: true },
  ])
})
