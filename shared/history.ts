import { dayWords, type ISODate, type WorkKind } from './coat'
import { listWords } from './coat/notes'
import { WORK_KIND_LABELS, type AuditEventView } from './types/kennel'

/** One audit row as a person reads it: what happened in a sentence, and each changed field on a line of its own. */
export interface HistoryLine {
  text: string
  changes: string[]
}

type Row = Record<string, unknown>

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/

/** Reads audit rows in words. `regionLabel` names a region key of the dog's profile. */
function wordsFor(event: AuditEventView, regionLabel: (key: string) => string) {
  const person = (id: unknown) => (typeof id === 'number' ? event.people?.[id] ?? 'a former member' : 'no one')
  const date = (value: unknown) => (typeof value === 'string' && ISO_DATE.test(value) ? dayWords(value as ISODate) : 'no date')
  const kind = (value: unknown) => (typeof value === 'string' ? WORK_KIND_LABELS[value as WorkKind]?.word.toLowerCase() ?? value : 'coat-work')
  const regions = (value: unknown) => (Array.isArray(value) && value.length ? listWords(value.map(k => regionLabel(String(k)))) : 'no region')
  const text = (value: unknown) => (value === null || value === undefined || value === '' ? 'none' : `“${String(value)}”`)
  const minutes = (value: unknown) => (typeof value === 'number' ? `${value} min` : 'none')
  return { person, date, kind, regions, text, minutes }
}

type Words = ReturnType<typeof wordsFor>

/** A field's label, and how one of its values reads. */
type FieldWords = [label: string, show: (value: unknown, w: Words) => string]

const WORK_FIELDS: Record<string, FieldWords> = {
  date: ['Date', (v, w) => w.date(v)],
  kind: ['Kind', (v, w) => w.kind(v)],
  regions: ['Regions', (v, w) => w.regions(v)],
  workedById: ['Worked by', (v, w) => w.person(v)],
  minutes: ['Minutes', (v, w) => w.minutes(v)],
  notes: ['Notes', (v, w) => w.text(v)],
}

const DOG_FIELDS: Record<string, FieldWords> = {
  callName: ['Call name', (v, w) => w.text(v)],
  registeredName: ['Registered name', (v, w) => w.text(v)],
  registrationNumber: ['Registration number', (v, w) => w.text(v)],
  breed: ['Breed', (v, w) => w.text(v)],
  sex: ['Sex', v => (v === 'bitch' ? 'bitch' : 'dog')],
  dateOfBirth: ['Date of birth', (v, w) => w.date(v)],
  colour: ['Colour', (v, w) => w.text(v)],
  ownerName: ['Owner', (v, w) => w.text(v)],
  ownerEmail: ['Owner e-mail', (v, w) => w.text(v)],
  ownerPhone: ['Owner phone', (v, w) => w.text(v)],
  handlerId: ['Handler', (v, w) => w.person(v)],
  coatProfileId: ['Coat profile', v => (typeof v === 'number' ? `profile ${v}` : 'none')],
  notes: ['Notes', (v, w) => w.text(v)],
}

const TASK_FIELDS: Record<string, FieldWords> = {
  assigneeId: ['Given to', (v, w) => w.person(v)],
  dueDate: ['Due', (v, w) => w.date(v)],
  windowStart: ['Window starts', v => (typeof v === 'string' ? v.slice(0, 5) : 'none')],
  windowEnd: ['Window ends', v => (typeof v === 'string' ? v.slice(0, 5) : 'none')],
  kind: ['Kind', (v, w) => w.kind(v)],
  regions: ['Regions', (v, w) => w.regions(v)],
  minutes: ['Minutes', (v, w) => w.minutes(v)],
  notes: ['Notes', (v, w) => w.text(v)],
}

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null)

function changesOf(before: Row, after: Row, fields: Record<string, FieldWords>, w: Words): string[] {
  const lines: string[] = []
  for (const [field, [label, show]] of Object.entries(fields)) {
    if (!same(before[field], after[field])) lines.push(`${label}: ${show(before[field], w)} → ${show(after[field], w)}`)
  }
  return lines
}

function describeWork(event: AuditEventView, actor: string, w: Words): HistoryLine {
  const before = event.before ?? {}
  const after = event.after ?? {}
  const row = event.action === 'create' ? after : before
  const what = `the ${w.kind(row.kind)} of ${w.date(row.date)}`
  switch (event.action) {
    case 'create': {
      const byOther = typeof after.workedById === 'number' && after.workedById !== after.recordedById
      return {
        text: `${actor} logged a ${w.kind(after.kind)} on ${w.regions(after.regions)}, ${w.date(after.date)}${byOther ? `, worked by ${w.person(after.workedById)}` : ''}`,
        changes: [],
      }
    }
    case 'update':
      return { text: `${actor} changed ${what}`, changes: changesOf(before, after, WORK_FIELDS, w) }
    case 'delete':
      return { text: `${actor} deleted ${what} (kept in the record, no longer counted)`, changes: [] }
    case 'restore':
      return { text: `${actor} restored ${what}`, changes: [] }
  }
}

function describeDog(event: AuditEventView, actor: string, w: Words): HistoryLine {
  const before = event.before ?? {}
  const after = event.after ?? {}
  const name = String((event.action === 'create' ? after : before).callName ?? 'the dog')
  switch (event.action) {
    case 'create':
      return { text: `${actor} added ${name}`, changes: [] }
    case 'delete':
      return { text: `${actor} deleted ${name}`, changes: [] }
    default: {
      const changes = changesOf(before, after, DOG_FIELDS, w)
      if (before.status !== after.status) {
        return { text: after.status === 'retired' ? `${actor} retired ${name}` : `${actor} made ${name} active again`, changes }
      }
      return { text: `${actor} changed ${name}'s record`, changes }
    }
  }
}

// What a task's status change means, from one status to the next.
function taskVerb(from: unknown, to: unknown): string {
  if (from === to) return 'changed'
  if (to === 'in-progress') return 'started'
  if (to === 'done') return 'finished'
  if (to === 'skipped') return 'skipped'
  if (from === 'in-progress' && to === 'open') return 'paused'
  return 'reopened'
}

function describeTask(event: AuditEventView, actor: string, w: Words): HistoryLine {
  const before = event.before ?? {}
  const after = event.after ?? {}
  const row = event.action === 'create' ? after : before
  const what = `the ${w.kind(row.kind)} task on ${w.regions(row.regions)}, due ${w.date(row.dueDate)}`
  switch (event.action) {
    case 'create':
      return {
        text: `${actor} made ${what}${typeof after.assigneeId === 'number' ? `, for ${w.person(after.assigneeId)}` : ''}`,
        changes: [],
      }
    case 'delete':
      return { text: `${actor} deleted ${what}`, changes: [] }
    default: {
      const verb = taskVerb(before.status, after.status)
      const changes = changesOf(before, after, TASK_FIELDS, w)
      // Giving a task to someone, or moving it, alone reads as one sentence.
      const only = (field: string) => verb === 'changed' && changes.length === 1 && !same(before[field], after[field])
      if (only('assigneeId')) {
        return { text: typeof after.assigneeId === 'number' ? `${actor} gave ${what}, to ${w.person(after.assigneeId)}` : `${actor} took ${what}, off ${w.person(before.assigneeId)}`, changes: [] }
      }
      if (only('dueDate')) return { text: `${actor} moved ${what}, to ${w.date(after.dueDate)}`, changes: [] }
      const reason = verb === 'skipped' && after.skipReason ? `: ${w.text(after.skipReason)}` : ''
      return { text: `${actor} ${verb} ${what}${reason}`, changes }
    }
  }
}

/** One audit row of a dog's history (its coat work, record or tasks) in words. */
export function describeAuditEvent(event: AuditEventView, regionLabel: (key: string) => string): HistoryLine {
  const w = wordsFor(event, regionLabel)
  const actor = event.actor?.name || 'Someone'
  if (event.entity === 'coat_work') return describeWork(event, actor, w)
  if (event.entity === 'dog') return describeDog(event, actor, w)
  if (event.entity === 'task') return describeTask(event, actor, w)
  return { text: `${actor} changed a ${event.entity.replace('_', ' ')}`, changes: [] }
}
