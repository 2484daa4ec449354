// The signed-in person's workshop as every page shows it: its name, display units and timezone
// (GET /api/auth/me, fetched once and shared under one key; settings refreshes it on save).
// Pages format through this, never with toLocaleString or toISOString: the days and times are
// the workshop's (shared/utils/workshop-format.ts), the numbers in its units
// (shared/utils/units-display.ts), the styles its locale's, so one change of the workshop's settings reaches every screen.
import { UNIT_LABELS, displayNumber, formatUnits, inputValue, metricValue, type Quantity, type UnitSystem } from '#shared/utils/units-display'
import { dayIn, formatDateTime, formatDay, formatNumber, formatTime, registerZoneOffsets, todayIn, workshopLocale, type WorkshopLocale, type ZoneOffsets } from '#shared/utils/workshop-format'

interface MeWorkshop { workshop?: { name: string; units: UnitSystem; timezone: string; locale?: WorkshopLocale; zoneOffsets?: ZoneOffsets } | null }

export const WORKSHOP_ME_KEY = 'workshop-me'

export function useWorkshopFormat() {
  // Read once per page render: a call after the first has its answer already (payload.data) asks
  // again only on a refresh. Without `immediate: false` for those, each later call on the server
  // fetched again (Nuxt's useAsyncData gives a key's later calls the first call's cached data,
  // which there was none, then runs the handler; dedupe covers only a read still under way): the
  // board's server render read /api/auth/me three times, one after another.
  const known = useNuxtApp().payload.data[WORKSHOP_ME_KEY] !== undefined
  const fetched = useFetch<MeWorkshop>('/api/auth/me', {
    key: WORKSHOP_ME_KEY, dedupe: 'defer', immediate: !known,
    getCachedData: (key, nuxt) => nuxt.payload.data[key] ?? nuxt.static.data[key],
  })
  const { data } = fetched
  // the zone's offsets, so days and times are written without Intl (app/plugins/zone-offsets.client.ts)
  watch(() => data.value?.workshop?.zoneOffsets, registerZoneOffsets, { immediate: true })
  const units = computed<UnitSystem>(() => data.value?.workshop?.units ?? 'metric')
  const zone = computed(() => data.value?.workshop?.timezone ?? 'UTC')
  const name = computed(() => data.value?.workshop?.name ?? '')
  const locale = computed(() => workshopLocale(data.value?.workshop?.locale))
  const label = computed(() => UNIT_LABELS[units.value])
  return {
    /** Await in a page's setup when a first render needs the zone or units (today, a default). */
    ready: Promise.resolve(fetched).then(() => undefined),
    units, zone, name, label, locale,
    /** '6.32 kg' / '13.93 lb' and the like, in the workshop's units. */
    mass: (kg: number, digits?: number) => formatUnits.mass(kg, units.value, digits),
    volume: (l: number, digits?: number) => formatUnits.volume(l, units.value, digits),
    temp: (c: number, digits?: number) => formatUnits.temp(c, units.value, digits),
    length: (m: number, digits?: number) => formatUnits.length(m, units.value, digits),
    density: (kgPerL: number, digits?: number) => formatUnits.density(kgPerL, units.value, digits),
    bags: (count: number, bagKg: number) => formatUnits.bags(count, bagKg, units.value),
    /** The number alone, for a column or input whose label names the unit. */
    num: (q: Quantity, metric: number, digits = 2) => displayNumber(q, metric, units.value, digits),
    toInput: (q: Quantity, metric: number | null | undefined, digits = 2) => inputValue(q, metric, units.value, digits),
    toMetric: (q: Quantity, typed: number | '' | null | undefined) => metricValue(q, typed, units.value),
    day: (at: Date | string | number) => formatDay(at, zone.value, locale.value),
    time: (at: Date | string | number) => formatTime(at, zone.value, locale.value),
    dateTime: (at: Date | string | number) => formatDateTime(at, zone.value, locale.value),
    /** A count or figure in the workshop's number style, e.g. '1,234'. */
    count: (n: number, digits = 0) => formatNumber(n, digits, locale.value),
    today: () => todayIn(zone.value),
    dayOf: (at: Date | string | number) => dayIn(at, zone.value),
  }
}
