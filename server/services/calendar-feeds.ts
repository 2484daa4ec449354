// Calendar feeds (ICS through ical-generator, a well-kept iCalendar library; RFC 5545): the
// deliveries and fixing days of the workshop or of one job, as all-day events a phone calendar
// subscribes to. The link carries a secret (32 random bytes, server/utils/tokens.ts); only its
// SHA-256 is stored. A lead makes and revokes links; a revoked or unknown link is a 404, and a
// link only ever shows its own workshop's rows (the workshop comes from the feed's row).
import ical from 'ical-generator'
import type { Actor } from '../utils/auth'
import type { CalendarFeedCreatedDto, CalendarFeedDto } from '#shared/types/deliveries'
import { calendarFeedsRepo, type CalendarFeedRow } from '../repos/calendar-feeds'
import { deliveriesRepo } from '../repos/deliveries'
import { jobsRepo } from '../repos/jobs'
import { loadWorkshop } from './workshop'

const feedDto = (f: CalendarFeedRow): CalendarFeedDto => ({
  id: f.id, job: f.job_id ? { id: f.job_id, code: f.job_code ?? '' } : null,
  createdAt: new Date(f.created_at).toISOString(), revokedAt: f.revoked_at ? new Date(f.revoked_at).toISOString() : null,
})

export async function listFeeds(actor: Actor): Promise<CalendarFeedDto[]> {
  return (await calendarFeedsRepo.list(useDb(), actor.workshopId)).map(feedDto)
}

export async function createFeed(actor: Actor, jobId: number | null): Promise<CalendarFeedCreatedDto> {
  const db = useDb()
  if (jobId && !(await jobsRepo.byId(db, actor.workshopId, jobId))) unprocessable([{ field: 'jobId', message: 'jobId must be a job of this workshop' }])
  const { token, hash } = newLinkToken()
  const id = await calendarFeedsRepo.insert(db, actor.workshopId, { jobId, tokenHash: hash, by: actor.id })
  const row = (await calendarFeedsRepo.byId(db, actor.workshopId, id))!
  return { ...feedDto(row), url: `${appEnv().APP_URL}/api/ics/${token}.ics` }
}

export async function revokeFeed(actor: Actor, id: number): Promise<CalendarFeedDto> {
  const db = useDb()
  if (!(await calendarFeedsRepo.revoke(db, actor.workshopId, id))) notFound('Calendar feed')
  return feedDto((await calendarFeedsRepo.byId(db, actor.workshopId, id))!)
}

const nextDay = (day: string) => {
  const d = new Date(`${day}T00:00:00Z`)
  d.setUTCDate(d.getUTCDate() + 1)
  return d
}

/** The feed's calendar text, or a 404 for a revoked or unknown secret. */
export async function feedIcs(token: string): Promise<string> {
  const db = useDb()
  const feed = await calendarFeedsRepo.live(db, hashLinkToken(token.replace(/\.ics$/, '')))
  if (!feed) notFound('Calendar feed')
  const ws = await loadWorkshop(db, feed.workshop_id)
  const rows = await deliveriesRepo.forFeed(db, feed.workshop_id, feed.job_id)
  const cal = ical({ name: feed.job_id && rows[0] ? `${ws.name}: ${rows[0].job_code}` : `${ws.name}: deliveries and fixing`, prodId: { company: 'Setline', product: 'Setline', language: 'EN' } })
  const host = new URL(appEnv().APP_URL).hostname
  for (const d of rows) {
    const where = [d.site_name, d.site_address, d.site_postcode].filter(Boolean).join(', ') || null
    cal.createEvent({
      id: `delivery-${d.id}@${host}`, allDay: true, start: new Date(`${d.delivery_day}T00:00:00Z`), end: nextDay(d.delivery_day),
      summary: `Delivery ${d.job_code} ${d.job_title}${d.state === 'delivered' ? ' (delivered)' : ''}`,
      description: `${d.pieces} pieces on ${d.vehicle}`, location: where,
    })
    if (d.fixing_on) {
      cal.createEvent({
        id: `fixing-${d.id}@${host}`, allDay: true, start: new Date(`${d.fixing_on}T00:00:00Z`), end: nextDay(d.fixing_on),
        summary: `Fixing ${d.job_code} ${d.job_title}`, description: `Fixing the pieces of the ${d.delivery_day} delivery`, location: where,
      })
    }
  }
  return cal.toString()
}
