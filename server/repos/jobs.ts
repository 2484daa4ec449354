// Every knex call for jobs (more verbs arrive with the catalogue issue).
import type { Knex } from 'knex'

export const jobsRepo = {
  /** Jobs a client user is a member of, in their workshop only. */
  forClient(db: Knex, workshopId: number, userId: number) {
    return db('jobs as j')
      .join('job_members as m', function () {
        this.on('m.job_id', 'j.id').andOn('m.workshop_id', 'j.workshop_id')
      })
      .where({ 'j.workshop_id': workshopId, 'm.user_id': userId })
      .select('j.id', 'j.code', 'j.title', 'j.site', 'j.due_on', 'j.state', 'j.sample_state')
      .select(db.raw('(SELECT count(*)::int FROM job_items i WHERE i.job_id = j.id AND i.workshop_id = j.workshop_id) AS item_count'))
      .orderByRaw('j.due_on NULLS LAST')
  },
}
