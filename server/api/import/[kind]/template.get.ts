import { importTemplate } from '../../../services/imports'
// The CSV template of a kind (lead): the export's columns and one invented example row.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'lead')
  const { kind } = validParams(event, importKindParamSchema)
  const { columns, example } = importTemplate(kind)
  return sendCsvRows(event, `setline-${kind}-template.csv`, [example], columns)
})
