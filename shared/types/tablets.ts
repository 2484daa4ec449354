// What the shared-tablet routes return: the lead's list of devices, the tablet's person picker
// and whether a caster or finisher has a PIN.
import type { Role } from './auth'

/** GET /api/tablets: one shared tablet; `current` marks the device asking. */
export interface TabletDeviceDto {
  id: number
  name: string
  revokedAt: string | null
  createdAt: string
  lastUsedAt: string
  signedInByName: string | null
  current: boolean
}

/** POST /api/tablets/:id/revoke */
export interface TabletRevokedDto { id: number; name: string; revokedAt: string | null }

/** POST /api/tablets: the new tablet, and where the device goes next (its picker). */
export interface TabletRegisteredDto { id: number; name: string; next: string }

/** POST /api/tablet/switch: who the tablet is now signed in as, and their home page. */
export interface TabletSwitchedDto { id: number; name: string; role: Role; home: string }

export interface TabletPersonDto { id: number; name: string; role: Role }

/** GET /api/tablet/people: the tablet, its workshop's name and who can switch in. */
export interface TabletPickerDto { tablet: { id: number; name: string }; workshop: string; people: TabletPersonDto[] }

/** GET /api/me/pin */
export interface PinStateDto { hasPin: boolean }
