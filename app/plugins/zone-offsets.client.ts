// The workshop zone's offsets from the server's page (GET /api/auth/me in the payload),
// registered before the page hydrates: its days and times are then written without Intl, whose
// first call on a page loads ICU (shared/utils/workshop-format.ts). useWorkshopFormat registers
// them again when the signed-in person's workshop is read later (a sign-in, a new timezone).
import { registerZoneOffsets, type ZoneOffsets } from '#shared/utils/workshop-format'

export default defineNuxtPlugin({
  name: 'zone-offsets',
  setup(nuxtApp) {
    const me = nuxtApp.payload.data[WORKSHOP_ME_KEY] as { workshop?: { zoneOffsets?: ZoneOffsets } | null } | undefined
    registerZoneOffsets(me?.workshop?.zoneOffsets)
  },
})
