// A wall-clock day and time in a zone as an instant, as a person types it on the board or on a
// tablet (a step recorded late): luxon does the zone arithmetic (IANA rules through Intl). A time
// inside a spring-forward gap moves on by the gap, as luxon's fromISO does. The tablets load it
// with the page, not when a form opens: a late step is often entered with the Wi-Fi gone.
import { DateTime } from 'luxon'

/** `day` ('yyyy-MM-dd') at `clock` ('HH:mm') in `zone`, as an ISO instant in UTC ('' for no such day or time). */
export function wallClockInstant(day: string, clock: string, zone: string): string {
  return DateTime.fromISO(`${day}T${clock}`, { zone }).toUTC().toISO() ?? ''
}
