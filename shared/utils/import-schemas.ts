// CSV import (server/services/imports.ts): the kinds of file Setline takes.
import { z } from 'zod'

export const IMPORT_KINDS = ['moulds', 'lots'] as const
export type ImportKind = (typeof IMPORT_KINDS)[number]
export const IMPORT_KIND_LABELS: Record<ImportKind, string> = { moulds: 'Moulds', lots: 'Plaster lots' }

export const importKindParamSchema = z.object({
  kind: z.enum(IMPORT_KINDS, { error: `kind must be one of ${IMPORT_KINDS.join(', ')}` }),
})
