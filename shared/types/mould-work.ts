// What the mould-work routes send (camelCase on the wire).
import type { MouldWorkStageRow } from '../utils/mould-work'

/** GET / PUT /api/moulds/[id]/work: the mould's open work (or its last one), null when it never had one. */
export interface MouldWork {
  id: number
  mouldId: number
  kind: 'new' | 'repair'
  stages: MouldWorkStageRow[]
  assignedTo: number | null
  assignedName: string | null
  startedOn: string
  availableFrom: string
  state: 'open' | 'done'
  notes: string | null
  version: number
}
