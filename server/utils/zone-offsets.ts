// A workshop zone's UTC offsets for the pages (GET /api/auth/me): about 13 months either side
// of today, so a browser writes the days and times it shows without asking Intl (whose first
// call on a page loads ICU; shared/utils/workshop-format.ts says why and how it is used). Built
// once per zone and day; a zone's rules do not change while the process runs.
import { zoneOffsets, type ZoneOffsets } from '#shared/utils/workshop-format'

const DAY_MS = 86_400_000
const SPAN_DAYS = 400
const kept = new Map<string, { day: number; table: ZoneOffsets }>()

export function workshopZoneOffsets(zone: string, now = Date.now()): ZoneOffsets {
  const day = Math.floor(now / DAY_MS)
  const hit = kept.get(zone)
  if (hit?.day === day) return hit.table
  const table = zoneOffsets(zone, (day - SPAN_DAYS) * DAY_MS, (day + SPAN_DAYS + 1) * DAY_MS)
  kept.set(zone, { day, table })
  return table
}
