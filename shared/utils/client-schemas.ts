// Shared zod schemas for client organisations, their contacts (which job mails each receives)
// and their sites (address and access notes for deliveries). Forms check with the same schemas.
import { z } from 'zod'
import { optionalText, requiredText, versionField } from './catalogue-schemas'

export const clientOrgFields = z.object({
  name: requiredText('name', 160),
  notes: optionalText('notes', 4000),
})
export const clientOrgCreateSchema = clientOrgFields
export const clientOrgPatchSchema = clientOrgFields.partial().extend({ version: versionField })

/** The job mails a contact may receive, and what each covers (the contact form's words). */
export const CONTACT_MAILS = ['mailProgress', 'mailSamples', 'mailDispatch', 'mailInvoices'] as const
export const CONTACT_MAIL_LABELS: Record<(typeof CONTACT_MAILS)[number], string> = {
  mailProgress: 'Progress (new photos of the work)',
  mailSamples: 'Samples (a sample is ready for approval)',
  mailDispatch: 'Dispatch and delivery (the job is ready to go)',
  mailInvoices: 'Invoices (each invoice of the job, with its PDF)',
}

const mailFlag = (field: string) => z.boolean({ error: `${field} must be true or false` }).optional()

export const contactFields = z.object({
  name: requiredText('name', 120),
  email: z.string({ error: 'email is required' }).trim().toLowerCase().max(254, 'email is too long').pipe(z.email({ message: 'email must be an e-mail address' })),
  phone: optionalText('phone', 40).refine(v => !v || /^[+\d\s().\-/]+$/.test(v), 'phone may use digits, spaces and + ( ) . - /'),
  role: optionalText('role', 120),
  mailProgress: mailFlag('mailProgress'),
  mailSamples: mailFlag('mailSamples'),
  mailDispatch: mailFlag('mailDispatch'),
  mailInvoices: mailFlag('mailInvoices'),
})
export const contactCreateSchema = contactFields
export const contactPatchSchema = contactFields.partial().extend({ version: versionField })

export const siteFields = z.object({
  name: requiredText('name', 160),
  address: requiredText('address', 500),
  postcode: optionalText('postcode', 20),
  openingHours: optionalText('openingHours', 300),
  parking: optionalText('parking', 500),
  lifting: optionalText('lifting', 500),
})
export const siteCreateSchema = siteFields
export const sitePatchSchema = siteFields.partial().extend({ version: versionField })

export type ClientOrgCreateInput = z.infer<typeof clientOrgCreateSchema>
export type ContactCreateInput = z.infer<typeof contactCreateSchema>
export type SiteCreateInput = z.infer<typeof siteCreateSchema>
