// Shared zod schemas for sign-in, invitations and password reset (forms and routes).
import { z } from 'zod'
import { idText } from './input-fields'

export const PASSWORD_MIN = 10
export const ROLE_VALUES = ['lead', 'caster', 'finisher', 'client'] as const

const email = z.string().trim().toLowerCase().max(254, 'email is too long').pipe(z.email({ message: 'email must be an e-mail address' }))
const newPassword = z.string()
  .min(PASSWORD_MIN, `password must be at least ${PASSWORD_MIN} characters`)
  .max(200, 'password must be at most 200 characters')
const token = z.string().regex(/^[\w-]{32,64}$/, 'token is not a valid link token')

export const loginSchema = z.object({
  email,
  password: z.string().min(1, 'password is required').max(200, 'password must be at most 200 characters'),
})

export const inviteSchema = z.object({
  email,
  role: z.enum(ROLE_VALUES, { message: 'role must be lead, caster, finisher or client' }),
  name: z.string().trim().min(1).max(120).optional(),
  clientOrgId: z.number().int().positive().optional(),
  jobId: z.number().int().positive().optional(),
})

export const acceptInviteSchema = z.object({
  token,
  name: z.string().trim().min(1, 'name is required').max(120, 'name must be at most 120 characters'),
  password: newPassword,
})

export const resetRequestSchema = z.object({ email })
export const resetConfirmSchema = z.object({ token, password: newPassword })
export const tokenQuerySchema = z.object({ token })

export const userPatchSchema = z.object({
  disabled: z.boolean().optional(),
  role: z.enum(ROLE_VALUES, { message: 'role must be lead, caster, finisher or client' }).optional(),
}).refine(v => v.disabled !== undefined || v.role !== undefined, { message: 'give disabled or role' })

export const idParamSchema = z.object({ id: idText('id') })
