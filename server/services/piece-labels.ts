// Labels: a piece's live label (its token drawn on the first print, the same on every reprint
// until a lead revokes it), a job's sheet of labels, revoking, and what a scanned token opens.
// A token opens a piece only for a signed-in person of the piece's workshop: another
// workshop's token, or one never issued, is "not a label of this workshop"; a revoked one says so.
import { randomBytes } from 'node:crypto'
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type { FinishingPieceDto } from '#shared/types/finishing'
import type { LabelRevokedDto, LabelScanDto, PieceLabelDto } from '#shared/types/pieces'
import { labelUrl, pieceNextSteps } from '#shared/utils/piece-labels'
import { pieceLabelsRepo } from '../repos/piece-labels'
import { piecesRepo } from '../repos/pieces'
import { jobsRepo } from '../repos/jobs'
import { pieceDto } from '../queries/finishing-queue'
import { pieceCard, piecePlaces } from '../queries/piece-page'

/** 16 random bytes, base64url: 22 characters, unguessable, short enough for a small QR code. */
const newLabelToken = () => randomBytes(16).toString('base64url')

/** The live token of each piece, drawing one for a piece that has none. */
async function liveTokens(db: Knex, actor: Actor, pieceIds: number[]): Promise<Map<number, string>> {
  let live = await pieceLabelsRepo.live(db, actor.workshopId, pieceIds)
  const missing = pieceIds.filter(id => !live.some(l => l.piece_id === id))
  if (missing.length) {
    for (const id of missing) await pieceLabelsRepo.insert(db, actor.workshopId, id, newLabelToken(), actor.id)
    live = await pieceLabelsRepo.live(db, actor.workshopId, pieceIds)
  }
  return new Map(live.map(l => [l.piece_id, l.token]))
}

async function labelDtos(db: Knex, actor: Actor, pieces: FinishingPieceDto[]): Promise<PieceLabelDto[]> {
  const ids = pieces.map(p => p.id)
  const [tokens, places] = await Promise.all([liveTokens(db, actor, ids), piecePlaces(db, actor.workshopId, ids)])
  const appUrl = appEnv().APP_URL
  return Promise.all(pieces.map(async (p) => {
    const url = labelUrl(appUrl, p.id, tokens.get(p.id)!)
    return {
      pieceId: p.id, mark: p.mark, job: p.job ? { code: p.job.code, title: p.job.title } : null, item: p.item?.description ?? null,
      place: places.get(p.id) ?? null, kg: p.handlingKg, teamLift: p.teamLift, url, qrSvg: await qrSvg(url),
    }
  }))
}

/** GET /api/pieces/:id/label */
export async function pieceLabel(actor: Actor, pieceId: number): Promise<PieceLabelDto> {
  const db = useDb()
  const [label] = await labelDtos(db, actor, [await pieceCard(db, actor.workshopId, pieceId)])
  return label!
}

/** GET /api/jobs/:id/labels: a label for each of the job's pieces still in the shop (not rejected, not gone), by mark. */
export async function jobLabels(actor: Actor, jobId: number): Promise<PieceLabelDto[]> {
  const db = useDb()
  if (!(await jobsRepo.byId(db, actor.workshopId, jobId))) notFound('The job')
  const rows = await piecesRepo.ofJob(db, actor.workshopId, jobId, ['to_fettle', 'repair', 'drying', 'ready', 'packed'])
  return labelDtos(db, actor, rows.map(pieceDto))
}

/** POST /api/pieces/:id/label/revoke: the piece's printed label opens nothing from now on; the next print draws a new one. */
export async function revokeLabel(actor: Actor, pieceId: number): Promise<LabelRevokedDto> {
  const db = useDb()
  await pieceCard(db, actor.workshopId, pieceId)
  const revoked = await pieceLabelsRepo.revoke(db, actor.workshopId, pieceId, actor.id)
  return { pieceId, revoked }
}

/** GET /api/labels/:token */
export async function scanLabel(actor: Actor, token: string): Promise<LabelScanDto> {
  const db = useDb()
  const label = await pieceLabelsRepo.byToken(db, actor.workshopId, token)
  if (!label) throw createError({ statusCode: 404, message: 'This label is not one of this workshop\'s: it opens nothing here' })
  if (label.revoked_at) throw createError({ statusCode: 404, message: 'This label was revoked: it opens nothing. Print the piece a new label from its page.' })
  const piece = await pieceCard(db, actor.workshopId, label.piece_id)
  return { piece, nextSteps: pieceNextSteps(piece.state) }
}
