import { previewImport } from '../../../services/imports'
// A CSV file's preview (lead): every row as it will land, problems per row and column; writes nothing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { kind } = validParams(event, importKindParamSchema)
  const upload = await readCsvUpload(event)
  return previewImport(actor.workshopId, kind, upload.fileName, upload.bytes)
})
