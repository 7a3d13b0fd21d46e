import { describe, expect, it } from 'vitest'
import { addCalendarMonths, addDays, assessDog, classEligibility, daysBetween, DEFAULT_PROFILE, type CoatProfile, type ISODate, type RegionState } from '../../../shared/coat'
import { buildDemoStories, buildLarkspurStory, buildNorthfoldStory, SEASON_DAYS, type KennelStory, type StoryDog, type Storyline } from '../../../seeders/kennel'

// Seed dates that move the story across weekdays, month ends, a leap day and both UK clock
// changes (last Sundays of March and October), so the demo holds whenever it is seeded.
const TODAYS: ISODate[] = [
  '2026-03-02', '2026-03-03', '2026-03-04', '2026-03-05', '2026-03-06', '2026-03-07', '2026-03-08',
  '2026-03-29', '2026-08-31', '2026-10-25', '2026-12-31', '2027-02-27', '2028-02-29',
]

const TOBIAS = 'tobias@larkspur.example'
const INES = 'ines@larkspur.example'
const ASSISTANTS = ['pip@larkspur.example', 'juno@larkspur.example']

function profileOf(story: KennelStory, dog: StoryDog): CoatProfile {
  return story.profiles.find(p => p.key === dog.profile)!
}

function nextShow(story: KennelStory, dog: StoryDog) {
  return story.entries
    .filter(e => e.dog === dog.key && e.status !== 'withdrawn')
    .map(e => story.shows.find(s => s.key === e.show)!)
    .filter(s => s.firstDay >= story.today)
    .sort((a, b) => (a.firstDay < b.firstDay ? -1 : 1))[0] ?? null
}

// What a manager reads off the dog's grid row for its next show.
function seenInGrid(story: KennelStory, dog: StoryDog): Storyline {
  if (dog.status === 'retired') return 'retired'
  const work = story.work.filter(w => w.dog === dog.key)
  if (!work.length) return 'no-record'
  const show = nextShow(story, dog)!
  const profile = profileOf(story, dog)
  const readiness = assessDog(profile, work, show.firstDay)
  if (readiness.onTrack) return 'on-track'
  if (readiness.regions.some(r => r.state === 'bare')) return 'bare'
  const weightIn = (state: RegionState) => readiness.regions
    .filter(r => r.state === state)
    .reduce((sum, r) => sum + profile.regions.find(p => p.key === r.region)!.weight, 0)
  return weightIn('past-peak') > weightIn('coming-in') ? 'past-peak' : 'late'
}

describe('the Larkspur demo season', () => {
  it.each(TODAYS)('seeded on %s, every dog shows its own story in the grid', (today) => {
    const story = buildLarkspurStory(today)
    const seen = Object.fromEntries(story.dogs.map(d => [d.callName, seenInGrid(story, d)]))
    const meant = Object.fromEntries(story.dogs.map(d => [d.callName, d.storyline]))
    expect(seen).toEqual(meant)
  })

  it.each(TODAYS)('seeded on %s, the grid holds a mix: on track, coming in late, past peak, a bare region, no record', (today) => {
    const story = buildLarkspurStory(today)
    const count = (s: Storyline) => story.dogs.filter(d => seenInGrid(story, d) === s).length
    expect(story.dogs.length).toBeGreaterThanOrEqual(18)
    expect(count('on-track')).toBeGreaterThanOrEqual(8)
    expect(count('late')).toBeGreaterThanOrEqual(2)
    expect(count('past-peak')).toBeGreaterThanOrEqual(1)
    expect(count('bare')).toBeGreaterThanOrEqual(1)
    expect(count('no-record')).toBe(1)
    expect(count('retired')).toBe(2)
  })

  it.each(TODAYS)('seeded on %s, coat work covers the last 16 weeks and none is after today', (today) => {
    const story = buildLarkspurStory(today)
    const dates = story.work.map(w => w.date).sort()
    expect(dates[0]! >= addDays(today, -SEASON_DAYS)).toBe(true)
    expect(dates[dates.length - 1]! <= today).toBe(true)
    expect(daysBetween(dates[0]!, today)).toBeGreaterThan(SEASON_DAYS - 14)
    expect(new Set(story.work.map(w => w.kind))).toEqual(new Set(['strip', 'layer', 'roll', 'card', 'bath', 'trim']))
    expect(new Set(story.work.map(w => w.by))).toEqual(new Set([...ASSISTANTS, TOBIAS, INES, 'maren@larkspur.example']))
    expect(story.work.every(w => w.minutes > 0 && w.notes.length > 0 && !w.notes.includes('{r}'))).toBe(true)
  })

  it.each(TODAYS)('seeded on %s, a dozen shows fall in the next four months, with entries closing 3-6 weeks before', (today) => {
    const story = buildLarkspurStory(today)
    expect(story.shows).toHaveLength(12)
    for (const show of story.shows) {
      expect(show.firstDay > today).toBe(true)
      expect(show.firstDay <= addCalendarMonths(today, 4, 'month-end')).toBe(true)
      expect(show.lastDay >= show.firstDay).toBe(true)
      expect(daysBetween(show.entriesClose.date, show.firstDay)).toBeGreaterThanOrEqual(21)
      expect(daysBetween(show.entriesClose.date, show.firstDay)).toBeLessThanOrEqual(42)
    }
    const closingSoon = story.shows.filter(s => s.entriesClose.date > today && daysBetween(today, s.entriesClose.date) <= 14)
    expect(closingSoon.length).toBeGreaterThanOrEqual(2)
    expect(story.shows.filter(s => s.timeZone !== 'Europe/London').map(s => s.timeZone)).toEqual(['Europe/Brussels'])
  })

  it.each(TODAYS)('seeded on %s, every entry\'s class fits the dog\'s age on the first day of the show (KC)', (today) => {
    const story = buildLarkspurStory(today)
    for (const entry of story.entries) {
      const dog = story.dogs.find(d => d.key === entry.dog)!
      const show = story.shows.find(s => s.key === entry.show)!
      const check = classEligibility('KC', dog.dateOfBirth, show.firstDay).find(c => c.code === entry.classCode)
      expect(check?.eligible, `${dog.callName} in ${entry.classCode} at ${show.name}`).toBe(true)
    }
  })

  it.each(TODAYS)('seeded on %s, a puppy turns exactly six months on the first day of its first show, and a dog is in Junior', (today) => {
    const story = buildLarkspurStory(today)
    // KC Definitions of Classes (from memory): Minor Puppy is six and not exceeding nine calendar
    // months on the first day of the show; General Show Regulations: none under six months.
    const puppies = story.dogs.filter((d) => {
      const show = nextShow(story, d)
      return show !== null && addCalendarMonths(d.dateOfBirth, 6, 'month-end') === show.firstDay
    })
    expect(puppies).toHaveLength(1)
    const debut = story.entries.find(e => e.dog === puppies[0]!.key)!
    expect(debut.classCode).toBe('kc:minor-puppy')
    const dayBefore = addDays(story.shows.find(s => s.key === debut.show)!.firstDay, -1)
    expect(classEligibility('KC', puppies[0]!.dateOfBirth, dayBefore).some(c => c.eligible)).toBe(false)
    expect(story.entries.some(e => e.classCode === 'kc:junior')).toBe(true)
    expect(story.entries.some(e => e.classCode === 'kc:veteran')).toBe(true)
  })

  it.each(TODAYS)('seeded on %s, entries carry statuses, armbands once confirmed, and handlers other than the dog\'s', (today) => {
    const story = buildLarkspurStory(today)
    const statuses = story.entries.map(e => e.status)
    expect(new Set(statuses)).toEqual(new Set(['planned', 'entered', 'confirmed', 'withdrawn']))
    expect(statuses.filter(s => s === 'withdrawn')).toHaveLength(1)
    expect(story.entries.every(e => (e.armband !== null) === (e.status === 'confirmed'))).toBe(true)
    for (const show of story.shows) {
      const bands = story.entries.filter(e => e.show === show.key && e.armband).map(e => e.armband)
      expect(new Set(bands).size).toBe(bands.length)
    }
    // Nothing is still only planned once entries have closed.
    for (const entry of story.entries.filter(e => e.status === 'planned')) {
      expect(story.shows.find(s => s.key === entry.show)!.entriesClose.date >= today).toBe(true)
    }
    const tobiasDogs = new Set(story.dogs.filter(d => d.handler === TOBIAS).map(d => d.key))
    expect(story.entries.filter(e => tobiasDogs.has(e.dog) && e.handler === INES).length).toBeGreaterThanOrEqual(2)
    expect(story.dogs.filter(d => d.handler === null && d.status === 'active').length).toBeGreaterThanOrEqual(1)
  })

  it.each(TODAYS)('seeded on %s, each assistant has tasks on a few dogs: open this week, done lately, one overdue', (today) => {
    const story = buildLarkspurStory(today)
    for (const assistant of ASSISTANTS) {
      const tasks = story.tasks.filter(t => t.assignee === assistant)
      const dogs = new Set(tasks.map(t => t.dog))
      expect(dogs.size).toBeGreaterThanOrEqual(2)
      expect(dogs.size).toBeLessThan(story.dogs.length / 2)
      expect(tasks.some(t => t.status === 'open' && t.dueDate >= today && t.dueDate <= addDays(today, 6))).toBe(true)
      // DESIGN.md §2: done tasks stay in an assistant's reach for 14 days after their due date.
      expect(tasks.some(t => t.status === 'done' && daysBetween(t.dueDate, today) <= 14)).toBe(true)
    }
    expect(story.tasks.filter(t => t.status === 'open' && t.dueDate < today)).toHaveLength(1)
    for (const task of story.tasks.filter(t => t.status === 'done')) {
      const work = story.work[task.work!]!
      expect([work.dog, work.date, work.kind, work.by]).toEqual([task.dog, task.dueDate, task.kind, task.assignee])
    }
  })

  it('uses only reserved contact details: .example e-mail and Ofcom\'s drama phone numbers', () => {
    const dogs = buildDemoStories(new Date('2026-03-02T09:00:00Z')).flatMap(s => s.dogs)
    // RFC 2606, section 3 reserves .example; Ofcom reserves 07700 900000-900999 for drama.
    expect(dogs.every(d => d.owner.email.endsWith('.example'))).toBe(true)
    expect(dogs.every(d => /^\+44 7700 900\d{3}$/.test(d.owner.phone))).toBe(true)
    expect(new Set(dogs.map(d => d.registrationNumber.toLowerCase())).size).toBe(dogs.length)
  })

  it('keeps the default profile\'s figures, adds area-timer limits, and copies it into a faster wire coat', () => {
    const [standard, fast] = buildLarkspurStory('2026-03-02').profiles
    expect(standard!.regions.map(({ timerMinutes: _t, ...r }) => r)).toEqual(DEFAULT_PROFILE.regions)
    expect(standard!.regions.every(r => r.timerMinutes! >= 8 && r.timerMinutes! <= 15)).toBe(true)
    expect(fast!.regions.map(r => r.key)).toEqual(standard!.regions.map(r => r.key))
    const quicker = fast!.regions.filter((r, i) => r.growDays < standard!.regions[i]!.growDays)
    expect(quicker.length).toBeGreaterThan(0)
    expect(fast!.regions.every((r, i) => r.growDays <= standard!.regions[i]!.growDays)).toBe(true)
  })
})

describe('the Northfold demo club', () => {
  it.each(TODAYS)('seeded on %s, has three dogs, two shows and FCI entries that fit the dogs\' ages', (today) => {
    const story = buildNorthfoldStory(today)
    expect(story.dogs).toHaveLength(3)
    expect(story.shows).toHaveLength(2)
    expect(story.shows.every(s => s.timeZone === 'Europe/Dublin' && s.firstDay > today)).toBe(true)
    expect(story.entries.length).toBeGreaterThanOrEqual(3)
    for (const entry of story.entries) {
      const dog = story.dogs.find(d => d.key === entry.dog)!
      const show = story.shows.find(s => s.key === entry.show)!
      expect(entry.classCode.startsWith('fci:')).toBe(true)
      expect(classEligibility('FCI', dog.dateOfBirth, show.firstDay).find(c => c.code === entry.classCode)?.eligible).toBe(true)
    }
  })
})

describe('the demo\'s today', () => {
  it('builds each organisation\'s story from its own date, not UTC\'s', () => {
    // 23:30 UTC on 30 June is 00:30 on 1 July in London and Dublin (both UTC+1 in summer, from memory).
    const stories = buildDemoStories(new Date('2026-06-30T23:30:00Z'))
    expect(stories.map(s => [s.organisation, s.today])).toEqual([
      ['Larkspur Hollow Kennel', '2026-07-01'],
      ['Northfold Wire Terrier Club', '2026-07-01'],
    ])
  })
})
