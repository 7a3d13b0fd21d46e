import { describe, expect, it } from 'vitest'
import { describeAuditEvent } from '../../../shared/history'
import type { AuditEventView } from '../../../shared/types/kennel'

// A dog's history in words. The wording is Bloomline's own (common practice, no source); the
// weekdays are checked against the Gregorian calendar: 2026-12-31 is a Thursday and 2027-01-04 a
// Monday (ISO 8601-1:2019 week dates: week 1 holds 4 January, so 2027-W01-1 is 4 January 2027),
// and 2026-10-19 a Monday (Zeller's congruence, worked by hand).
const LABELS: Record<string, string> = { neck: 'Neck', ears: 'Ears', rear: 'Rear' }
const label = (key: string) => LABELS[key] ?? key
const maren = { id: 1, name: 'Maren Oakhurst' }

function event(fields: Partial<AuditEventView>): AuditEventView {
  return { id: 1, entity: 'coat_work', entityId: 9, action: 'create', actor: maren, at: '2026-12-01T09:00:00.000Z', before: null, after: null, people: {}, ...fields }
}

const work = { id: 9, dogId: 4, date: '2026-10-19', kind: 'layer', regions: ['ears'], workedById: 1, recordedById: 1, minutes: 10, notes: null, deletedAt: null }
const task = { id: 5, dogId: 4, kind: 'layer', regions: ['neck', 'rear'], dueDate: '2026-12-31', assigneeId: null, status: 'open', skipReason: null, minutes: null, notes: null, windowStart: null, windowEnd: null }

describe('coat work in words', () => {
  it('names the kind, regions and day, and who worked when it was someone else', () => {
    expect(describeAuditEvent(event({ after: work }), label)).toEqual({ text: 'Maren Oakhurst logged a layer on Ears, Mon 19 Oct 2026', changes: [] })
    const byPip = describeAuditEvent(event({ after: { ...work, workedById: 3, regions: ['neck', 'ears', 'rear'] }, people: { 3: 'Pip Adeyemi-Rowe' } }), label)
    expect(byPip.text).toBe('Maren Oakhurst logged a layer on Neck, Ears and Rear, Mon 19 Oct 2026, worked by Pip Adeyemi-Rowe')
  })

  it('lists each changed field from before to after, and nothing that stayed', () => {
    const changed = describeAuditEvent(event({ action: 'update', before: work, after: { ...work, date: '2026-12-31', minutes: 25, notes: 'Took longer' } }), label)
    expect(changed).toEqual({
      text: 'Maren Oakhurst changed the layer of Mon 19 Oct 2026',
      changes: ['Date: Mon 19 Oct 2026 → Thu 31 Dec 2026', 'Minutes: 10 min → 25 min', 'Notes: none → “Took longer”'],
    })
  })

  it('says a deletion keeps the work on record, and a restore brings it back', () => {
    expect(describeAuditEvent(event({ action: 'delete', before: work, after: { ...work, deletedAt: '2026-12-01T09:00:00Z' } }), label).text)
      .toBe('Maren Oakhurst deleted the layer of Mon 19 Oct 2026 (kept in the record, no longer counted)')
    expect(describeAuditEvent(event({ action: 'restore', before: work, after: work }), label).text).toBe('Maren Oakhurst restored the layer of Mon 19 Oct 2026')
  })
})

describe('the dog\'s record in words', () => {
  const dog = { id: 4, callName: 'Bracken', breed: 'Wire-haired Dachshund', status: 'active', handlerId: 2, ownerEmail: null, dateOfBirth: '2022-03-01' }
  it('says retiring as retiring, and other changes field by field with people by name', () => {
    expect(describeAuditEvent(event({ entity: 'dog', action: 'update', before: dog, after: { ...dog, status: 'retired' } }), label)).toEqual({ text: 'Maren Oakhurst retired Bracken', changes: [] })
    expect(describeAuditEvent(event({ entity: 'dog', action: 'update', before: { ...dog, status: 'retired' }, after: dog }), label).text).toBe('Maren Oakhurst made Bracken active again')
    const moved = describeAuditEvent(event({ entity: 'dog', action: 'update', before: dog, after: { ...dog, handlerId: 3, ownerEmail: 'owner@holt.example' }, people: { 2: 'Tobias Wrenfield', 3: 'Ines Calloway' } }), label)
    expect(moved).toEqual({ text: 'Maren Oakhurst changed Bracken\'s record', changes: ['Owner e-mail: none → “owner@holt.example”', 'Handler: Tobias Wrenfield → Ines Calloway'] })
  })

  it('adding and deleting name the dog', () => {
    expect(describeAuditEvent(event({ entity: 'dog', action: 'create', after: dog }), label).text).toBe('Maren Oakhurst added Bracken')
    expect(describeAuditEvent(event({ entity: 'dog', action: 'delete', before: dog }), label).text).toBe('Maren Oakhurst deleted Bracken')
  })
})

describe('tasks in words', () => {
  const people = { 3: 'Pip Adeyemi-Rowe' }
  it('making, giving, starting, finishing, skipping and reopening read as such', () => {
    expect(describeAuditEvent(event({ entity: 'task', after: { ...task, assigneeId: 3 }, people }), label).text)
      .toBe('Maren Oakhurst made the layer task on Neck and Rear, due Thu 31 Dec 2026, for Pip Adeyemi-Rowe')
    const given = describeAuditEvent(event({ entity: 'task', action: 'update', before: task, after: { ...task, assigneeId: 3, dueDate: '2027-01-04' }, people }), label)
    expect(given).toEqual({
      text: 'Maren Oakhurst changed the layer task on Neck and Rear, due Thu 31 Dec 2026',
      changes: ['Given to: no one → Pip Adeyemi-Rowe', 'Due: Thu 31 Dec 2026 → Mon 4 Jan 2027'],
    })
    expect(describeAuditEvent(event({ entity: 'task', action: 'update', before: task, after: { ...task, assigneeId: 3 }, people }), label))
      .toEqual({ text: 'Maren Oakhurst gave the layer task on Neck and Rear, due Thu 31 Dec 2026, to Pip Adeyemi-Rowe', changes: [] })
    expect(describeAuditEvent(event({ entity: 'task', action: 'update', before: { ...task, assigneeId: 3 }, after: task, people }), label).text)
      .toBe('Maren Oakhurst took the layer task on Neck and Rear, due Thu 31 Dec 2026, off Pip Adeyemi-Rowe')
    expect(describeAuditEvent(event({ entity: 'task', action: 'update', before: task, after: { ...task, dueDate: '2027-01-04' } }), label).text)
      .toBe('Maren Oakhurst moved the layer task on Neck and Rear, due Thu 31 Dec 2026, to Mon 4 Jan 2027')
    const step = (from: string, to: string, extra: Record<string, unknown> = {}) =>
      describeAuditEvent(event({ entity: 'task', action: 'update', actor: { id: 3, name: 'Pip Adeyemi-Rowe' }, before: { ...task, status: from }, after: { ...task, status: to, ...extra } }), label)
    expect(step('open', 'in-progress').text).toMatch(/^Pip Adeyemi-Rowe started the layer task/)
    expect(step('in-progress', 'open').text).toMatch(/^Pip Adeyemi-Rowe paused/)
    expect(step('in-progress', 'done', { minutes: 7 })).toMatchObject({ text: expect.stringMatching(/^Pip Adeyemi-Rowe finished/), changes: ['Minutes: none → 7 min'] })
    expect(step('open', 'skipped', { skipReason: 'She was off colour.' }).text).toMatch(/skipped the layer task on Neck and Rear, due Thu 31 Dec 2026: “She was off colour\.”$/)
    expect(step('done', 'open').text).toMatch(/^Pip Adeyemi-Rowe reopened/)
  })

  it('someone no longer in the organisation, or no actor at all, still reads', () => {
    const line = describeAuditEvent(event({ entity: 'task', action: 'update', actor: null, before: task, after: { ...task, assigneeId: 42 } }), label)
    expect(line).toEqual({ text: 'Someone gave the layer task on Neck and Rear, due Thu 31 Dec 2026, to a former member', changes: [] })
    expect(describeAuditEvent(event({ entity: 'task', action: 'update', before: null, after: null }), label).text).toBe('Maren Oakhurst changed the coat-work task on no region, due no date')
  })
})
