// A job's states and its sample's, with the words the screens show for them. No zod here, so a
// page that only shows a job (the client's job page, the lead's list) does not load the
// validation library (job-schemas.ts holds the schemas and imports the states from here).
export const JOB_STATES = ['open', 'on_hold', 'done', 'cancelled'] as const
export const SAMPLE_STATES = ['not_required', 'awaiting_cast', 'awaiting_approval', 'approved', 'changes_requested'] as const
export const JOB_STATE_LABELS: Record<(typeof JOB_STATES)[number], string> = { open: 'Open', on_hold: 'On hold', done: 'Done', cancelled: 'Cancelled' }
export const SAMPLE_STATE_LABELS: Record<(typeof SAMPLE_STATES)[number], string> = {
  not_required: 'No sample needed',
  awaiting_cast: 'Sample to be cast',
  awaiting_approval: 'Sample awaiting approval',
  approved: 'Sample approved',
  changes_requested: 'Changes requested',
}
