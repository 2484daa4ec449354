// A mould's materials and states, with the words the screens show for them. No zod here, so the
// board, which shows a mould's state, does not load the validation library (catalogue-schemas.ts
// holds the schemas and imports these lists).
export const MOULD_MATERIALS = ['silicone', 'polyurethane', 'grp_case', 'plaster_piece', 'gelatine'] as const
export const MOULD_STATES = ['ready', 'in_use', 'cleaning', 'repair', 'retired'] as const

export const MOULD_MATERIAL_LABELS: Record<(typeof MOULD_MATERIALS)[number], string> = {
  silicone: 'Silicone rubber',
  polyurethane: 'Polyurethane rubber',
  grp_case: 'Rigid glass-fibre case',
  plaster_piece: 'Plaster piece mould',
  gelatine: 'Gelatine',
}
export const MOULD_STATE_LABELS: Record<(typeof MOULD_STATES)[number], string> = {
  ready: 'Ready', in_use: 'In use', cleaning: 'Cleaning', repair: 'Repair', retired: 'Retired',
}
