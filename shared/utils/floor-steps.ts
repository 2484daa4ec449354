// The floor's pour actions as the cards and the server know them: which state each action
// starts from and moves to, and the words for what went wrong with a cast. No zod here, so the
// caster's page draws its cards without loading the validation library (floor-schemas.ts holds
// the action schemas; the action form loads it when it opens).
/**
 * The trade's words for what went wrong with a cast: one list for demoulding and finishing
 * (common practice in fibrous and solid plaster shops: an arris is a sharp edge, enrichment the
 * modelled ornament). Earlier demoulds may carry older words (chipped edge, distorted, soft cast).
 */
export const CAST_DEFECTS = ['air holes', 'crack', 'short fill', 'soft or chalky', 'chipped arris', 'broken enrichment', 'warped', 'stuck in mould', 'damaged in handling'] as const
/** What the caster picks at demould: the one list. */
export const FLOOR_DEFECTS = CAST_DEFECTS
export type FloorDefect = (typeof FLOOR_DEFECTS)[number]

export const FLOOR_ACTION_KINDS = ['start_mixing', 'poured', 'demoulded'] as const
export type FloorActionKind = (typeof FLOOR_ACTION_KINDS)[number]

/** The state a pour must be in for each action, and the state it moves to. */
export const FLOOR_STEPS: Record<FloorActionKind, { from: string; to: string }> = {
  start_mixing: { from: 'planned', to: 'mixing' },
  poured: { from: 'mixing', to: 'setting' },
  demoulded: { from: 'setting', to: 'demoulded' },
}
