import { confirmImport } from '../../../services/imports'
// Imports the CSV file the lead previewed (sent again): all rows in one transaction, or none.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { kind } = validParams(event, importKindParamSchema)
  const upload = await readCsvUpload(event)
  const result = await confirmImport(actor.workshopId, actor.id, kind, upload.fileName, upload.bytes)
  setResponseStatus(event, 201)
  return result
})
