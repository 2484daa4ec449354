import { describe, expect, it } from 'vitest'
import { fieldLabel, inUserWords } from '#shared/utils/field-labels'
import { plasterRangeMessage, PLASTER_LIMITS } from '#shared/utils/plaster-core'

// The labels are the forms' own (our words); the checks are that a code name never reaches a person.
describe('fieldLabel', () => {
  it('names fields as the forms label them, walls by their number from 1', () => {
    expect(fieldLabel('waterTempC')).toBe('Water temperature')
    expect(fieldLabel('walls.4.lengthM')).toBe('Wall 5')
    expect(fieldLabel('walls[4].lengthM')).toBe('Wall 5')
    expect(fieldLabel('minPieceM')).toBe('Shortest piece')
    expect(fieldLabel('params.id')).toBe('params.id')
  })
})

describe('inUserWords', () => {
  it('says an empty required field is required', () => {
    expect(inUserWords('waterTempC', plasterRangeMessage('waterTempC', PLASTER_LIMITS.waterTempC), undefined, true)).toBe('Water temperature is required')
    expect(inUserWords('consistency', 'consistency must be between 18.6 and 200', '', true)).toBe('Consistency is required')
    expect(inUserWords('consistency', 'Invalid input: expected number, received string', '', true)).toBe('Consistency is required')
  })
  it('keeps a schema\'s own sentence for an empty field: it already says what to do', () => {
    expect(inUserWords('mouldId', 'choose a mould or name a profile', null, true)).toBe('choose a mould or name a profile')
  })
  it('puts labels for code names in a message, a plain name only where it leads', () => {
    expect(inUserWords('consistency', plasterRangeMessage('consistency', PLASTER_LIMITS.consistency), 5, true)).toMatch(/^Consistency must be between 18.6 and 200/)
    expect(inUserWords('walls.4.lengthM', 'walls[4].lengthM (0.1 m) cannot be cut', 0.1, true)).toBe('Wall 5 (0.1 m) cannot be cut')
    expect(inUserWords('x', 'lower minPieceM or raise castLengthM')).toBe('lower Shortest piece or raise Cast length')
    expect(inUserWords('notes', 'the consistency of notes')).toBe('the consistency of notes')
  })
})
