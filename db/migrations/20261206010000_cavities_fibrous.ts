// Multi-cavity moulds and fibrous casts.
// - moulds.cavities: one pour fills every cavity, so it makes that many pieces (default 1).
// - moulds.cast_type: 'solid' fills the cavity; 'fibrous' lays a shell of gauged plaster with
//   hessian scrim and timber laths over the mould's face, so its plaster comes from the face's
//   surface area and the shell's thickness (both required for a fibrous mould).
// - pieces: a pour now makes one piece per cavity (pieces.cavity, 1..N), unique per pour and cavity.
// - consumables (scrim, laths, …) kept as stock per workshop: a ledger of receipts (+) and uses
//   per pour (−), the stock on hand its sum; each mould lists what one cast uses.
// Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('moulds', (t) => {
    t.integer('cavities').notNullable().defaultTo(1)
    t.text('cast_type').notNullable().defaultTo('solid')
    t.decimal('surface_area_m2', 8, 3)
    t.decimal('shell_thickness_mm', 6, 2)
  })
  await knex.raw(`ALTER TABLE moulds ADD CONSTRAINT moulds_cast_check CHECK (cavities BETWEEN 1 AND 100
    AND cast_type IN ('solid', 'fibrous')
    AND (surface_area_m2 IS NULL OR surface_area_m2 > 0) AND (shell_thickness_mm IS NULL OR shell_thickness_mm > 0)
    AND (cast_type = 'solid' OR (surface_area_m2 IS NOT NULL AND shell_thickness_mm IS NOT NULL)))`)

  await knex.schema.alterTable('pieces', (t) => {
    t.dropUnique(['pour_id'])
    t.integer('cavity').notNullable().defaultTo(1)
    t.unique(['pour_id', 'cavity'])
  })

  await knex.schema.createTable('consumables', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.text('name').notNullable()
    // 'm2' (scrim by area), 'm' (laths by length), 'each' (laths or ties by count)
    t.text('unit').notNullable().checkIn(['m2', 'm', 'each'], 'consumables_unit_check')
    // optional mass per unit, kg: adds to a fibrous piece's handling weight
    t.decimal('kg_per_unit', 8, 3)
    t.timestamp('archived_at', { useTz: true })
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('CREATE UNIQUE INDEX consumables_workshop_name_unique ON consumables (workshop_id, lower(name))')
  await knex.raw('ALTER TABLE consumables ADD CONSTRAINT consumables_kg_check CHECK (kg_per_unit IS NULL OR kg_per_unit >= 0)')

  await knex.schema.createTable('mould_consumables', (t) => {
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('mould_id').notNullable().references('moulds.id').onDelete('CASCADE')
    t.bigInteger('consumable_id').notNullable().references('consumables.id').onDelete('RESTRICT')
    t.decimal('quantity_per_cast', 10, 3).notNullable()
    t.primary(['mould_id', 'consumable_id'])
  })
  await knex.raw('ALTER TABLE mould_consumables ADD CONSTRAINT mould_consumables_quantity_check CHECK (quantity_per_cast > 0)')

  await knex.schema.createTable('consumable_moves', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('consumable_id').notNullable().references('consumables.id').onDelete('RESTRICT')
    t.text('kind').notNullable().checkIn(['received', 'used'], 'consumable_moves_kind_check')
    // signed: + received, − used
    t.decimal('quantity', 12, 3).notNullable()
    t.bigInteger('pour_id').references('pours.id').onDelete('RESTRICT')
    t.text('note')
    t.bigInteger('actor_id').references('users.id').onDelete('SET NULL')
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.index(['workshop_id', 'consumable_id'])
  })
  await knex.raw(`ALTER TABLE consumable_moves ADD CONSTRAINT consumable_moves_sign_check CHECK (
    (kind = 'received' AND quantity > 0 AND pour_id IS NULL) OR (kind = 'used' AND quantity < 0 AND pour_id IS NOT NULL))`)
  // a pour uses each consumable once (the poured step runs once)
  await knex.raw('CREATE UNIQUE INDEX consumable_moves_pour_unique ON consumable_moves (pour_id, consumable_id) WHERE pour_id IS NOT NULL')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('consumable_moves')
  await knex.schema.dropTableIfExists('mould_consumables')
  await knex.schema.dropTableIfExists('consumables')
  await knex.schema.alterTable('pieces', (t) => {
    t.dropUnique(['pour_id', 'cavity'])
    t.dropColumn('cavity')
    t.unique(['pour_id'])
  })
  await knex.raw('ALTER TABLE moulds DROP CONSTRAINT moulds_cast_check')
  await knex.schema.alterTable('moulds', (t) => {
    t.dropColumn('shell_thickness_mm')
    t.dropColumn('surface_area_m2')
    t.dropColumn('cast_type')
    t.dropColumn('cavities')
  })
}
