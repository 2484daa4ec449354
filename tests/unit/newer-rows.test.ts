// A tablet page's late read never moves a card back a step: each row keeps the newer version
// of what the page held (an outbox answer) and what the read brought.
import { describe, expect, it } from 'vitest'
import { keepNewerRows } from '../../app/utils/newer-rows'

type Row = { id: number; version: number; state: string }
const id = (r: Row) => r.id
const version = (r: Row) => r.version

describe('keepNewerRows', () => {
  it('keeps a held row that is newer than the read\'s (the read left before the step was committed)', () => {
    const held = [{ id: 1, version: 3, state: 'mixing' }, { id: 2, version: 1, state: 'planned' }]
    const fresh = [{ id: 1, version: 2, state: 'planned' }, { id: 2, version: 1, state: 'planned' }]
    expect(keepNewerRows(held, fresh, id, version)).toEqual([{ id: 1, version: 3, state: 'mixing' }, { id: 2, version: 1, state: 'planned' }])
  })
  it('takes the read\'s row when it is as new or newer (another tablet or the lead moved it on)', () => {
    const held = [{ id: 1, version: 3, state: 'mixing' }]
    expect(keepNewerRows(held, [{ id: 1, version: 4, state: 'void' }], id, version)).toEqual([{ id: 1, version: 4, state: 'void' }])
    expect(keepNewerRows(held, [{ id: 1, version: 3, state: 'setting' }], id, version)).toEqual([{ id: 1, version: 3, state: 'setting' }])
  })
  it('follows the read for which rows there are: a row gone from the read is gone, a new one comes in', () => {
    const held = [{ id: 1, version: 9, state: 'setting' }]
    expect(keepNewerRows(held, [{ id: 5, version: 1, state: 'planned' }], id, version)).toEqual([{ id: 5, version: 1, state: 'planned' }])
    expect(keepNewerRows(undefined, [{ id: 5, version: 1, state: 'planned' }], id, version)).toEqual([{ id: 5, version: 1, state: 'planned' }])
  })
})
