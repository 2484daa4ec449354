// Shared tablets and PINs: the PIN a caster or finisher sets on /account,
// the switch on a shared tablet, and a lead naming a device. Forms and routes use the same schemas.
import { z } from 'zod'

/** The shared tablet's device cookie (httpOnly; set by POST /api/tablets, server/utils/tablet.ts). */
export const TABLET_COOKIE = 'setline-tablet'
export const TABLET_PIN_MIN = 4
export const TABLET_PIN_MAX = 8
/**
 * Who may switch in on a shared tablet with a PIN: the shop-floor roles. Leads are left out on
 * purpose: a lead can invite people, disable them and revoke tablets, too much to guard with a
 * few digits; a lead signs in on a tablet with their password like anywhere else.
 */
export const TABLET_ROLES = ['caster', 'finisher'] as const
export type TabletRole = (typeof TABLET_ROLES)[number]
export const isTabletRole = (role: string): role is TabletRole => (TABLET_ROLES as readonly string[]).includes(role)

/**
 * Why a PIN is too easy to guess, or undefined when it will do. Refused: one digit repeated
 * (0000, 1111…) and a straight run up or down the keypad's digits (1234, 4321, 7890, 0987…).
 * These are the PINs people pick most and so the first ones anyone tries; refusing the most
 * common values is what NIST SP 800-63B §5.1.1.2 asks of memorized secrets, and banks do the
 * same for card PINs (common practice).
 */
export function tabletPinWeakness(pin: string): string | undefined {
  if (!/^\d+$/.test(pin) || pin.length < 2) return undefined
  const d = [...pin].map(Number)
  if (d.every(x => x === d[0])) return 'pin must not be one digit repeated'
  const steps = d.slice(1).map((x, i) => (x - d[i]! + 10) % 10)
  if (steps.every(s => s === 1) || steps.every(s => s === 9)) return 'pin must not be a run of digits such as 1234 or 4321'
  return undefined
}

const pinShape = z.string({ message: 'pin is required' })
  .regex(new RegExp(`^\\d{${TABLET_PIN_MIN},${TABLET_PIN_MAX}}$`), `pin must be ${TABLET_PIN_MIN} to ${TABLET_PIN_MAX} digits`)

/** A new PIN: the shape, then not an easy one. */
export const tabletNewPin = pinShape.superRefine((pin, ctx) => {
  const weak = tabletPinWeakness(pin)
  if (weak) ctx.addIssue({ code: 'custom', message: weak })
})

/** Set or change my PIN, confirmed with my password. */
export const tabletPinSetSchema = z.object({
  pin: tabletNewPin,
  password: z.string({ message: 'password is required' }).min(1, 'password is required').max(200, 'password must be at most 200 characters'),
})

/** Switch the tablet to a person: their id (from the picker) and their PIN. Only the shape is checked here. */
export const tabletSwitchSchema = z.object({
  userId: z.number({ message: 'userId must be a number' }).int().positive({ message: 'userId must be a positive whole number' }),
  pin: pinShape,
})

/** A lead names the device they are holding as a shared tablet. */
export const tabletDeviceSchema = z.object({
  name: z.string({ message: 'name is required' }).trim().min(1, 'name is required').max(60, 'name must be at most 60 characters'),
})
