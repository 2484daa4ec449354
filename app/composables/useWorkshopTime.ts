// Times on the board and the floor are shown and entered in the workshop's timezone,
// whatever zone the browser is in. The styles people read (a time, a day, both) come from the
// one formatting module (shared/utils/workshop-format.ts, 24-hour clock); luxon does the
// arithmetic of wall-clock entry (shared/utils/wall-clock.ts).
import { wallClockInstant } from '#shared/utils/wall-clock'
import { addCalendarDays, dayIn, formatDateTime, formatDay, formatTime, todayIn, workshopLocale, type WorkshopLocale } from '#shared/utils/workshop-format'

export function useWorkshopTime(zone: MaybeRefOrGetter<string>) {
  const z = () => toValue(zone)
  // the locale rides on the signed-in person's workshop, fetched once by useWorkshopFormat
  const me = useNuxtData<{ workshop?: { locale?: WorkshopLocale } | null }>(WORKSHOP_ME_KEY)
  const l = () => workshopLocale(me.data.value?.workshop?.locale)
  return {
    /** 'HH:mm' of an instant in the workshop's zone, 24-hour clock. */
    clock: (iso: string) => formatTime(iso, z(), l()),
    /** The day and time of an instant, e.g. 'Thu 3 Dec 2026 14:30'. */
    when: (iso: string) => formatDateTime(iso, z(), l()),
    /** The day of an instant (or a 'yyyy-MM-dd' day) for people, e.g. 'Thu 3 Dec 2026'. */
    date: (iso: string) => formatDay(iso, z(), l()),
    /** 'yyyy-MM-dd' of an instant in the workshop's zone. */
    day: (iso: string | Date) => dayIn(iso, z()),
    /** Today in the workshop's zone. */
    today: () => todayIn(z()),
    /** A wall-clock date and time in the workshop's zone as an ISO instant. */
    toInstant: (day: string, clock: string) => wallClockInstant(day, clock, z()),
    /** Adds whole days to a 'yyyy-MM-dd' day (calendar arithmetic: no zone, and no Intl as a page loads). */
    addDays: (day: string, n: number) => addCalendarDays(day, n),
  }
}
