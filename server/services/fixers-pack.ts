// The fixer's pack: one PDF per job for the people who fix the work on site (renderPdf,
// server/utils/pdf.ts). The job, client and site (address, access, lifting notes); the cautions;
// the fixing method notes written on the job; then item by item in the job's order (the order
// the lead lists them is the fixing order) and, for a run, wall by wall in the order the walls
// were entered: each wall's length and the cast lengths cut for it (runCutList, the same cut
// list the planner uses), mitres and returns where the cut list has them; then every piece with
// its mark, weight and a two-person mark over FINISHING_TEAM_LIFT_KG (25 kg, HSE INDG143); last
// the job's drawings and photos, each on its own page.
//
// Cautions (common practice): plaster casts are heavy and brittle and are often fixed overhead.
// Setline lists weights; it does not design fixings. How a piece is held, supported and lifted
// is for a competent person to decide under local building codes and regulations.
import { loadSharp } from '../utils/photo-image'
import type { Actor } from '../utils/auth'
import { FINISHING_TEAM_LIFT_KG } from '#shared/utils/finishing'
import { runCutList, type PlasterRunWall } from '#shared/utils/plaster-cutlist'
import { formatNumber, workshopLocale } from '#shared/utils/workshop-format'
import { jobsRepo } from '../repos/jobs'
import { jobItemsRepo } from '../repos/job-items'
import { photosRepo } from '../repos/photos'
import { clientSitesRepo } from '../repos/client-sites'
import { cratesRepo } from '../repos/crates'
import { piecesRepo } from '../repos/pieces'
import { photoStorage, readPhotoFile } from '../utils/storage'
import { loadWorkshop } from './workshop'

export const FIXERS_CAUTION = `Plaster casts are heavy and brittle, and much of this work is fixed overhead. Pieces over ${FINISHING_TEAM_LIFT_KG} kg are marked for two people or a lifting aid. Setline lists weights; it does not design fixings. How each piece is held, supported and lifted, and the access equipment used, is for a competent person to decide under local building codes and regulations.`

/** The most photos a pack carries (each a page): a bound on the work one request does. */
const PACK_MAX_PHOTOS = 40

export async function fixersPackPdf(actor: Actor, jobId: number): Promise<{ filename: string; pdf: Buffer }> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job) notFound('Job')
  const [ws, heading, items, photos] = await Promise.all([
    loadWorkshop(db, actor.workshopId), cratesRepo.jobHeading(db, actor.workshopId, jobId),
    jobItemsRepo.forJob(db, actor.workshopId, jobId), photosRepo.forJob(db, actor.workshopId, jobId, false),
  ])
  const site = job.site_id ? await clientSitesRepo.byId(db, actor.workshopId, Number(job.site_id)) : undefined
  const pieces = await piecesRepo.ofJob(db, actor.workshopId, jobId, ['ready', 'packed', 'dispatched'])
  const images: { caption: string | null; jpeg: Buffer }[] = []
  for (const p of photos.slice(0, PACK_MAX_PHOTOS)) {
    const stored = await photosRepo.byId(db, actor.workshopId, p.id)
    const file = stored ? await readPhotoFile(photoStorage(), stored.display_key) : null
    // stored as WebP (server/utils/photo-image.ts); PDFKit draws JPEG and PNG only
    if (file) images.push({ caption: p.caption, jpeg: await (await loadSharp())(file).jpeg({ quality: 80 }).toBuffer() })
  }
  const locale = workshopLocale(ws.locale)
  const m = (n: number) => `${formatNumber(n, 2, locale)} m`
  const kg = (n: number) => `${formatNumber(n, 1, locale)} kg`

  const pdf = await renderPdf({ title: `Fixer's pack ${job.code}`, author: ws.name }, (doc) => {
    pdfHeader(doc, ws.name, `Fixer's pack: ${job.code} ${job.title}`, heading?.client ? `Client: ${heading.client}` : undefined)
    doc.font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.ink)
    if (site) {
      doc.text(`Site: ${site.name}, ${site.address}${site.postcode ? `, ${site.postcode}` : ''}`)
      if (site.opening_hours) doc.text(`Opening hours: ${site.opening_hours}`)
      if (site.parking) doc.text(`Parking: ${site.parking}`)
      if (site.lifting) doc.text(`Lifting on site: ${site.lifting}`)
    }
    else if (job.site) doc.text(`Site: ${job.site}`)
    doc.moveDown(0.6).font('Helvetica-Bold').fillColor(PDF_COLOURS.kiln).text('Caution')
    doc.font('Helvetica').fillColor(PDF_COLOURS.ink).text(FIXERS_CAUTION)
    doc.moveDown(0.6).font('Helvetica-Bold').text('Fixing method notes')
    doc.font('Helvetica').text(job.notes?.trim() || 'No fixing notes on the job: ask the workshop before fixing.')
    pdfRule(doc)

    items.forEach((item, n) => {
      doc.font('Helvetica-Bold').fontSize(12).fillColor(PDF_COLOURS.ink).text(`${n + 1}. ${item.description}`)
      doc.font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.muted)
        .text([item.profile && `Profile ${item.profile}`, item.mould_code && `mould ${item.mould_code}`].filter(Boolean).join(', ') || ' ')
      doc.fillColor(PDF_COLOURS.ink)
      const walls = Array.isArray(item.walls) ? item.walls as PlasterRunWall[] : []
      const cast = item.cast_length_m === null ? null : Number(item.cast_length_m)
      if (walls.length && cast) {
        const cut = runCutList({ walls, castLengthM: cast, minPieceM: Math.min(Number(item.min_piece_m ?? 0), cast), sparesPct: 0 })
        pdfTable(doc, [{ label: 'Wall', width: 10 }, { label: 'Wall length', width: 16, align: 'right' }, { label: 'Run', width: 14, align: 'right' }, { label: 'Pieces in fixing order', width: 40 }, { label: 'Mitres and returns', width: 24 }],
          walls.map((w, i) => {
            const mine = cut.cuts.filter(c => c.wall === i)
            const ends = [w.start, w.end].filter(e => e && e !== 'square')
            return [`Wall ${i + 1}`, m(w.lengthM), m(cut.runM[i]!), mine.map(c => `${c.kind === 'return' ? 'return ' : ''}${m(c.lengthM)}`).join(', '),
              ends.length ? ends.map(e => (e === 'return' ? 'return' : `${e} mitre`)).join(', ') : 'square ends']
          }))
      }
      else if (walls.length) {
        doc.text(`Walls: ${walls.map((w, i) => `Wall ${i + 1} ${m(w.lengthM)}`).join(', ')} (no cast length on the mould, so no cut list)`)
      }
      const mine = pieces.filter(p => Number(p.item_id) === Number(item.id))
      if (mine.length) {
        doc.moveDown(0.3)
        pdfTable(doc, [{ label: 'Mark', width: 30 }, { label: 'Weight', width: 16, align: 'right' }, { label: 'Lift', width: 30 }, { label: 'Where', width: 24 }], mine.map((p) => {
          const w = Number(p.weighed_kg ?? p.dry_mass_kg)
          return [p.mark, kg(w), w > FINISHING_TEAM_LIFT_KG ? 'Two people or a lifting aid' : 'One person', p.state === 'dispatched' ? 'Delivered' : 'In the workshop']
        }))
      }
      else doc.text('No finished pieces of this item yet.')
      doc.moveDown(0.8)
    })

    for (const img of images) {
      doc.addPage()
      doc.font('Helvetica-Bold').fontSize(11).fillColor(PDF_COLOURS.ink).text(img.caption ?? 'Photo or drawing')
      doc.moveDown(0.4).image(img.jpeg, { fit: [doc.page.width - doc.page.margins.left - doc.page.margins.right, 600] })
    }
  })
  return { filename: `fixers-pack-${job.code}.pdf`.replace(/[^\w.-]/g, '_'), pdf }
}
