// CSV import (server/services/imports.ts): the kinds of file Setline takes.
import { z } from 'zod'

export const IMPORT_KINDS = ['moulds', 'lots', 'grades', 'benches', 'clients', 'sites', 'jobs'] as const
export type ImportKind = (typeof IMPORT_KINDS)[number]
export const IMPORT_KIND_LABELS: Record<ImportKind, string> = {
  moulds: 'Moulds', lots: 'Plaster lots', grades: 'Plaster grades', benches: 'Benches',
  clients: 'Clients and contacts', sites: 'Client sites', jobs: 'Open jobs with their items',
}
/** The kinds whose export is the import's own (GET /api/import/[kind]/export); moulds and lots export from their pages. */
export const EXPORT_KINDS = ['grades', 'benches', 'clients', 'sites', 'jobs'] as const satisfies readonly ImportKind[]
export const exportKindParamSchema = z.object({
  kind: z.enum(EXPORT_KINDS, { error: `kind must be one of ${EXPORT_KINDS.join(', ')}` }),
})

export const importKindParamSchema = z.object({
  kind: z.enum(IMPORT_KINDS, { error: `kind must be one of ${IMPORT_KINDS.join(', ')}` }),
})
