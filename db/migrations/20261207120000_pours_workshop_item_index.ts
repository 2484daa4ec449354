// The board, the planner and a client's progress count an item's pieces by walking its pours
// (server/repos/planning.ts COUNTED_PIECES: WHERE p.workshop_id = i.workshop_id AND
// p.job_item_id = i.id). The (job_item_id, id) index serves the register's pages; on a fresh
// table without planner statistics the count still walked every pour per item. This index
// matches the count's own condition (tests/bench/board.ts measures the board with it).
import type { Knex } from 'knex'

export async function up(knex: Knex) {
  await knex.raw('CREATE INDEX pours_workshop_job_item ON pours (workshop_id, job_item_id) WHERE state <> \'void\'')
}

export async function down(knex: Knex) {
  await knex.raw('DROP INDEX IF EXISTS pours_workshop_job_item')
}
