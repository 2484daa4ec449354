// The tablet outbox's owner rules: a step goes out only under the session of the person who
// took it, in tap order; others' steps wait grouped by person; a 401 stops sending.
import { describe, expect, it } from 'vitest'
import { outcomeOf, sendableBy, stepsWord, unowned, waitingForOthers, type OwnedEntry } from '../../app/utils/outbox-owners'

const ada = { id: 7, name: 'Ada Marle' }
const idris = { id: 9, name: 'Idris Penhale' }
const at = (min: number) => new Date(Date.UTC(2031, 2, 5, 9, min)).toISOString()
type E = OwnedEntry & { id: string }
const entry = (id: string, min: number, owner?: typeof ada, status = 'pending'): E => ({ id, tappedAt: at(min), status, ...(owner ? { owner } : {}) })

const entries: E[] = [
  entry('a2', 2, ada),
  entry('i1', 1, idris),
  entry('a1', 0, ada),
  entry('old', 3),
  entry('a-done', 4, ada, 'done'),
  entry('i-refused', 5, idris, 'refused'),
  entry('i2', 6, idris),
  entry('i3', 7, idris),
]

describe('sendableBy', () => {
  it('gives only the signed-in person\'s pending steps, in tap order', () => {
    expect(sendableBy(entries, ada).map(e => e.id)).toEqual(['a1', 'a2'])
    expect(sendableBy(entries, idris).map(e => e.id)).toEqual(['i1', 'i2', 'i3'])
  })
  it('sends nothing with no one signed in, and nothing for a person with no steps', () => {
    expect(sendableBy(entries, null)).toEqual([])
    expect(sendableBy(entries, undefined)).toEqual([])
    expect(sendableBy(entries, { id: 99, name: 'Someone else' })).toEqual([])
  })
  it('never sends a step without a recorded owner by itself', () => {
    for (const me of [ada, idris, { id: 0, name: '' }]) expect(sendableBy(entries, me).some(e => e.id === 'old')).toBe(false)
  })
  it('matches the person by id, not by name', () => {
    expect(sendableBy(entries, { id: ada.id, name: 'Renamed' }).map(e => e.id)).toEqual(['a1', 'a2'])
    expect(sendableBy(entries, { id: 123, name: ada.name })).toEqual([])
  })
})

describe('waitingForOthers', () => {
  it('groups the others\' pending steps by person, in order of their first step', () => {
    expect(waitingForOthers(entries, ada)).toEqual([{ owner: idris, count: 3 }])
    expect(waitingForOthers(entries, idris)).toEqual([{ owner: ada, count: 2 }])
    expect(waitingForOthers(entries, null)).toEqual([{ owner: ada, count: 2 }, { owner: idris, count: 3 }])
  })
  it('counts no settled steps and no steps without an owner', () => {
    expect(waitingForOthers(entries.filter(e => e.owner?.id !== idris.id), ada)).toEqual([])
  })
})

describe('unowned', () => {
  it('lists the pending steps queued before owners were recorded', () => {
    expect(unowned(entries).map(e => e.id)).toEqual(['old'])
    expect(unowned([entry('old-done', 1, undefined, 'done')])).toEqual([])
  })
})

describe('outcomeOf', () => {
  it('stops for a sign-in on 401, instead of retrying it', () => {
    expect(outcomeOf(401)).toBe('sign-in')
  })
  it('retries a network failure, 408, 429 and 5xx', () => {
    for (const s of [undefined, 0, 408, 429, 500, 502, 503]) expect(outcomeOf(s)).toBe('retry')
  })
  it('keeps the server\'s other answers as refusals', () => {
    for (const s of [400, 403, 404, 409, 422]) expect(outcomeOf(s)).toBe('refused')
  })
})

it('stepsWord says step or steps', () => {
  expect([stepsWord(1), stepsWord(2)]).toEqual(['1 step', '2 steps'])
})
