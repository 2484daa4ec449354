// Times on the board and the floor are shown and entered in the workshop's timezone,
// whatever zone the browser is in (luxon does the zone arithmetic).
import { DateTime } from 'luxon'

export function useWorkshopTime(zone: MaybeRefOrGetter<string>) {
  const z = () => toValue(zone)
  return {
    /** 'HH:mm' of an instant in the workshop's zone. */
    clock: (iso: string) => DateTime.fromISO(iso, { zone: z() }).toFormat('HH:mm'),
    /** A short weekday, day, month and time of an instant, e.g. 'Tue 4 Mar 14:30'. */
    when: (iso: string) => DateTime.fromISO(iso, { zone: z() }).toFormat('ccc d LLL HH:mm'),
    /** 'yyyy-MM-dd' of an instant in the workshop's zone. */
    day: (iso: string | Date) => (typeof iso === 'string' ? DateTime.fromISO(iso, { zone: z() }) : DateTime.fromJSDate(iso, { zone: z() })).toISODate()!,
    /** Today in the workshop's zone. */
    today: () => DateTime.now().setZone(z()).toISODate()!,
    /** A wall-clock date and time in the workshop's zone as an ISO instant. */
    toInstant: (day: string, clock: string) => DateTime.fromISO(`${day}T${clock}`, { zone: z() }).toUTC().toISO()!,
    /** Adds whole days to a 'yyyy-MM-dd' day. */
    addDays: (day: string, n: number) => DateTime.fromISO(day, { zone: z() }).plus({ days: n }).toISODate()!,
  }
}
