import type { Sequelize, Transaction } from 'sequelize'
import { addCalendarMonths, addDays, classEligibility, daysBetween, DEFAULT_PROFILE, type ISODate, type RuleSet, type WorkKind } from '../shared/coat'
import { DEFAULT_TIMER_MINUTES, type DogSex, type DogStatus, type EntryStatus, type StoredRegion, type TaskStatus } from '../shared/types/kennel'
import { CoatProfileRow, CoatWorkRow, Dog, Entry, initModels, Show, Task } from '../server/database/models'
import { todayInTimeZone, wallClockToInstant } from '../server/utils/time'
import { DEMO_ORGANISATIONS } from './accounts'

// The demo's coat season, built relative to "today" in each organisation's time zone so that it
// tells the same story whenever it is seeded. Every dog, owner, show, club, place and judge is
// invented. E-mail addresses use the reserved `.example` domain (RFC 2606, section 3); phone
// numbers are in 07700 900000-900999, which Ofcom reserves for drama (Ofcom, "Telephone numbers
// for use in TV and radio drama"), so none can ring a real person.

const MAREN = 'maren@larkspur.example'
const TOBIAS = 'tobias@larkspur.example'
const INES = 'ines@larkspur.example'
const PIP = 'pip@larkspur.example'
const JUNO = 'juno@larkspur.example'
const CORRIE = 'corrie@northfold.example'

/** How far back the demo's coat work reaches: sixteen weeks. */
export const SEASON_DAYS = 16 * 7

const ALL = DEFAULT_PROFILE.regions.map(r => r.key)
const SLOW = ['topline', 'sides']
const MID = ['head', 'neck', 'throat', 'shoulders', 'chest', 'rear', 'tail']
const EARS = ['ears']
const TIGHT = ['neck', 'shoulders', 'rear']
// DESIGN.md §4: rear/hips and neck are the regions most prone to undercoat (common practice).
const UNDERCOAT = ['rear', 'neck']
const FURNISHINGS = ['head', 'chest', 'tail']
const LABELS = new Map(DEFAULT_PROFILE.regions.map(r => [r.key, r.label.toLowerCase()]))

// Area-timer limits per region, the team's starting figures (from memory): the big flat areas
// take longest, the small tender ones (ears, throat) least.
const TIMER_MINUTES: Record<string, number> = { head: 10, ears: 8, neck: 12, throat: 8, shoulders: 12, chest: 10, topline: 15, sides: 15, rear: 12, tail: 8 }
// A wire coat whose furnishings and short head hair come back quicker (from memory; editable).
const FAST_GROW_DAYS: Record<string, number> = { head: 10, ears: 5, throat: 10, chest: 10, tail: 10 }

export interface StoryProfile {
  key: string
  label: string
  toleranceDays: number
  onTrackScore: number
  isDefault: boolean
  regions: StoredRegion[]
}

/** What the dog's coat is meant to show in the grid for its next show; the unit test holds the seed to it. */
export type Storyline = 'on-track' | 'late' | 'past-peak' | 'bare' | 'no-record' | 'retired'

export interface StoryDog {
  key: string
  callName: string
  registeredName: string
  registrationNumber: string
  breed: string
  sex: DogSex
  dateOfBirth: ISODate
  colour: string
  owner: { name: string, email: string, phone: string }
  /** A member's e-mail, or null for an owner-handled dog. */
  handler: string | null
  profile: string
  notes: string | null
  status: DogStatus
  storyline: Storyline | null
}

export interface StoryWork {
  dog: string
  date: ISODate
  kind: WorkKind
  regions: string[]
  by: string
  minutes: number
  notes: string
}

export interface StoryShow {
  key: string
  name: string
  club: string
  firstDay: ISODate
  lastDay: ISODate
  place: string
  judges: string[]
  timeZone: string
  /** On the show's own wall clock. */
  entriesClose: { date: ISODate, time: string }
  notes: string | null
}

export interface StoryEntry {
  dog: string
  show: string
  classCode: string
  armband: string | null
  status: EntryStatus
  handler: string | null
  notes: string | null
}

export interface StoryTask {
  dog: string
  kind: WorkKind
  regions: string[]
  dueDate: ISODate
  window: { start: string, end: string } | null
  assignee: string
  createdBy: string
  status: TaskStatus
  skipReason: string | null
  minutes: number | null
  notes: string
  /** Index into the story's work of the coat work that finished the task. */
  work: number | null
}

export interface KennelStory {
  organisation: string
  ruleSet: RuleSet
  timeZone: string
  today: ISODate
  profiles: StoryProfile[]
  dogs: StoryDog[]
  work: StoryWork[]
  shows: StoryShow[]
  entries: StoryEntry[]
  tasks: StoryTask[]
}

interface Pull {
  /** Counted from the dog's next show, or from today. */
  from: 'show' | 'today'
  at: number
  kind: 'strip' | 'layer'
  regions: readonly string[]
  note: string
}

interface EntryPlan { show: number, status?: EntryStatus, handler?: string | null, notes?: string }

interface DogPlan extends Omit<StoryDog, 'dateOfBirth' | 'storyline'> {
  born: (shows: readonly StoryShow[]) => ISODate
  storyline: Storyline | null
  entries: (number | EntryPlan)[]
  classes: string[]
  pulls: Pull[]
  /** Retired and newly arrived dogs get no routine rolling and trimming. */
  care: 'show' | 'rest' | 'none'
}

interface ShowPlan extends Omit<StoryShow, 'firstDay' | 'lastDay' | 'entriesClose' | 'timeZone'> {
  /** Days after the first Saturday the season's shows start from. */
  offset: number
  days: number
  closeDaysBefore: number
  closeTime: string
  timeZone?: string
}

function storedProfiles(): StoryProfile[] {
  const regions: StoredRegion[] = DEFAULT_PROFILE.regions.map(r => ({ ...r, timerMinutes: TIMER_MINUTES[r.key] ?? DEFAULT_TIMER_MINUTES }))
  const standard: StoryProfile = {
    key: DEFAULT_PROFILE.key,
    label: DEFAULT_PROFILE.label,
    toleranceDays: DEFAULT_PROFILE.toleranceDays,
    onTrackScore: DEFAULT_PROFILE.onTrackScore,
    isDefault: true,
    regions,
  }
  const fast: StoryProfile = {
    ...standard,
    key: 'fast-furnishing-wire-coat',
    label: 'Fast-furnishing wire coat',
    isDefault: false,
    regions: regions.map(r => ({ ...r, growDays: FAST_GROW_DAYS[r.key] ?? r.growDays })),
  }
  return [standard, fast]
}

/**
 * The layers that bring both profiles into bloom for the next show (DESIGN.md §4: sides and
 * topline 70 and 63 days ahead, the other regions 56, ears 49, each with a margin inside its
 * hold), after a strip-out to the skin at the start of the season when that falls in it.
 */
function readyFor(earsAt: number | null = -54): Pull[] {
  const pulls: Pull[] = [
    { from: 'show', at: -150, kind: 'strip', regions: ALL, note: 'Stripped out to the skin to start the season.' },
    { from: 'show', at: -78, kind: 'layer', regions: SLOW, note: 'Serious layer off the {r}: the slow regions go first.' },
    { from: 'show', at: -64, kind: 'layer', regions: MID, note: 'Took a good layer off the {r}.' },
  ]
  if (earsAt !== null) pulls.push({ from: 'show', at: earsAt, kind: 'layer', regions: EARS, note: 'Ears done last, as they come back quickest.' })
  return pulls
}

const layerAll = (at: number, note: string): Pull[] => [{ from: 'show', at, kind: 'layer', regions: ALL, note }]

const NOTES: Record<WorkKind, string[]> = {
  strip: ['Stripped the {r} to the skin.'],
  layer: ['Took a serious layer off the {r}; it came away cleanly.', 'Layered the {r} down to the undercoat; dog settled well.'],
  roll: ['Rolled the longest hairs on the {r}.', 'Light roll over the {r} to keep it tight.', 'Quick roll on the {r}; coat lying flat.'],
  card: ['Carded out the undercoat on the {r}; plenty came away.', 'Raked the {r} gently; skin looked fine.', 'Carded the {r}; less undercoat than last time.'],
  bath: ['Bath to stand the coat up for the next day\'s work.', 'Bath and towel dry; coat standing up well.'],
  trim: ['Tidied the furnishings on the {r}.', 'Scissored the {r} neat.'],
}

function regionWords(regions: readonly string[]): string {
  const words = regions.map(r => LABELS.get(r) ?? r)
  return words.length <= 1 ? words.join('') : `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`
}

// Minutes in line with the area timer: a serious layer takes about the timer's limit per region.
function minutesFor(kind: WorkKind, regions: readonly string[]): number {
  const timer = regions.reduce((sum, r) => sum + (TIMER_MINUTES[r] ?? DEFAULT_TIMER_MINUTES), 0)
  const factor: Record<WorkKind, number> = { strip: 1.4, layer: 1, roll: 0.4, card: 0.5, bath: 0, trim: 0.6 }
  return kind === 'bath' ? 30 : Math.max(5, Math.round(timer * factor[kind] / 5) * 5)
}

const isoWeekday = (date: ISODate): number => (((daysBetween('1970-01-05', date) % 7) + 7) % 7) + 1

/** The first Saturday at least `minDays` after `today`. */
function saturdayAfter(today: ISODate, minDays: number): ISODate {
  const from = addDays(today, minDays)
  return addDays(from, (6 - isoWeekday(from) + 7) % 7)
}

function ageBefore(today: ISODate, years: number, days: number): ISODate {
  return addDays(addCalendarMonths(today, -12 * years, 'month-end'), -days)
}

function planShows(start: ISODate, plans: ShowPlan[], timeZone: string): StoryShow[] {
  return plans.map(({ offset, days, closeDaysBefore, closeTime, timeZone: zone, ...show }) => {
    const firstDay = addDays(start, offset)
    return {
      ...show,
      firstDay,
      lastDay: addDays(firstDay, days - 1),
      timeZone: zone ?? timeZone,
      entriesClose: { date: addDays(firstDay, -closeDaysBefore), time: closeTime },
    }
  })
}

function pickClass(ruleSet: RuleSet, dateOfBirth: ISODate, firstDay: ISODate, preferences: readonly string[]): string | null {
  const checks = classEligibility(ruleSet, dateOfBirth, firstDay)
  return preferences.find(code => checks.find(c => c.code === code)?.eligible) ?? null
}

interface Cast {
  ruleSet: RuleSet
  today: ISODate
  shows: StoryShow[]
  /** Who does the serious work when a dog has no handler, and who does the routine work. */
  lead: string
  helpers: string[]
}

function buildDogs(plans: DogPlan[], cast: Cast) {
  const dogs: StoryDog[] = []
  const work: StoryWork[] = []
  const entries: StoryEntry[] = []
  const armbands = new Map<string, number>()
  const earliest = addDays(cast.today, -SEASON_DAYS)
  const inSeason = (date: ISODate) => date >= earliest && date <= cast.today

  plans.forEach((plan, index) => {
    const { born, entries: entryPlans, classes, pulls, care, ...fields } = plan
    const dog: StoryDog = { ...fields, dateOfBirth: born(cast.shows) }
    dogs.push(dog)

    const planned = entryPlans.map(e => (typeof e === 'number' ? { show: e } : e))
    let showDay: ISODate | null = null
    for (const [n, e] of planned.entries()) {
      const show = cast.shows[e.show]!
      const classCode = pickClass(cast.ruleSet, dog.dateOfBirth, show.firstDay, classes)
      if (!classCode) continue
      if (e.status !== 'withdrawn' && (showDay === null || show.firstDay < showDay)) showDay = show.firstDay
      let status: EntryStatus = e.status ?? 'planned'
      if (!e.status) {
        const closesIn = daysBetween(cast.today, show.entriesClose.date)
        if (closesIn < 0) status = e.show === 0 || (index + n) % 2 === 0 ? 'confirmed' : 'entered'
        else if (closesIn <= 14) status = (index + n) % 2 === 0 ? 'entered' : 'planned'
      }
      let armband: string | null = null
      if (status === 'confirmed') {
        const next = (armbands.get(show.key) ?? 10 + 7 * e.show) + 1 + (index % 3)
        armbands.set(show.key, next)
        armband = String(next)
      }
      entries.push({ dog: dog.key, show: show.key, classCode, armband, status, handler: e.handler === undefined ? dog.handler : e.handler, notes: e.notes ?? null })
    }

    // The pulls are timed from the dog's next live entry, the show the grid assesses it for.
    const fromShow = showDay ?? cast.today
    const workers = [dog.handler ?? cast.lead, ...cast.helpers]
    let turn = index
    const add = (date: ISODate, kind: WorkKind, regions: readonly string[], note?: string, by?: string) => {
      if (!inSeason(date)) return
      const choices = NOTES[kind]
      const text = (note ?? choices[(index + work.length) % choices.length]!).replace('{r}', regionWords(regions))
      work.push({ dog: dog.key, date, kind, regions: [...regions], by: by ?? workers[turn++ % workers.length]!, minutes: minutesFor(kind, regions), notes: text })
    }

    for (const pull of pulls) {
      const date = addDays(pull.from === 'show' ? fromShow : cast.today, pull.at)
      if (!inSeason(date)) continue
      // A bath the day before serious work stands the coat up (DESIGN.md §4: work within 48 hours of a bath).
      if (pull.regions.length > 1) add(addDays(date, -1), 'bath', ALL, undefined, cast.helpers[turn % cast.helpers.length])
      add(date, pull.kind, pull.regions, pull.note, workers[turn++ % workers.length])
      const tight = pull.regions.filter(r => TIGHT.includes(r))
      if (care === 'show' && pull.kind === 'layer' && tight.length) {
        // DESIGN.md §4: tight regions are kept tight with a roll about every three weeks.
        for (const after of [21, 42]) add(addDays(date, after), 'roll', tight)
      }
    }
    if (care !== 'none') {
      for (let day = -SEASON_DAYS + 6 + (index % 5) * 3; day <= 0; day += 28) add(addDays(cast.today, day), 'card', UNDERCOAT)
      for (let day = -SEASON_DAYS + 14 + (index % 4) * 4; day <= 0 && care === 'show'; day += 28) add(addDays(cast.today, day), 'trim', FURNISHINGS)
    }
  })
  work.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0))
  return { dogs, work, entries }
}

const LARKSPUR_SHOWS: ShowPlan[] = [
  { key: 'ambledown', name: 'Ambledown & District Canine Society Open Show', club: 'Ambledown & District Canine Society', place: 'Ambledown Agricultural Hall, Ambledown', judges: ['Mrs Hester Quenby'], offset: 0, days: 1, closeDaysBefore: 35, closeTime: '23:59', notes: 'Benching from 8.00; terriers judged in ring 3 after lunch.' },
  { key: 'wirecoat-champ', name: 'Wirecoat Terrier Association Championship Show', club: 'Wirecoat Terrier Association', place: 'Sallowby Showground, Sallowby', judges: ['Mr Dorian Arkwright-Lowe', 'Mrs Tamsin Pell'], offset: 7, days: 1, closeDaysBefore: 28, closeTime: '12:00', notes: null },
  { key: 'kettlewold', name: 'Kettlewold Canine Club Open Show', club: 'Kettlewold Canine Club', place: 'Kettlewold Village Hall, Kettlewold', judges: ['Ms Rhiannon Voss'], offset: 14, days: 1, closeDaysBefore: 21, closeTime: '23:59', notes: 'Small hall: grooming tables outside if dry.' },
  { key: 'brindlemere', name: 'Brindlemere Terrier Club Championship Show', club: 'Brindlemere Terrier Club', place: 'Brindlemere Equestrian Centre, Brindlemere', judges: ['Mr Osric Hallam'], offset: 21, days: 1, closeDaysBefore: 24, closeTime: '12:00', notes: null },
  { key: 'hathercombe', name: 'Hathercombe Championship Show', club: 'Hathercombe Canine Society', place: 'Hathercombe Park Showground, Hathercombe', judges: ['Mrs Elspeth Garrow', 'Mr Benedikt Strand'], offset: 35, days: 2, closeDaysBefore: 35, closeTime: '23:59', notes: 'Two days: terriers on the Saturday.' },
  { key: 'fenmarsh', name: 'Fenmarsh Open Show', club: 'Fenmarsh Canine Club', place: 'Fenmarsh Leisure Centre, Fenmarsh', judges: ['Mr Caspian Holt'], offset: 42, days: 1, closeDaysBefore: 40, closeTime: '23:59', notes: null },
  { key: 'wolderley', name: 'Wolderley Terrier Society Open Show', club: 'Wolderley Terrier Society', place: 'Wolderley Memorial Hall, Wolderley', judges: ['Mrs Anwen Trelissick'], offset: 56, days: 1, closeDaysBefore: 42, closeTime: '12:00', notes: null },
  { key: 'ostvelde', name: 'Ostvelde International Terrier Weekend', club: 'Ostvelde Terrier Circle', place: 'Ostvelde Expo Hall, Ostvelde, Belgium', judges: ['Mevr. Liesbet Vandamme', 'Dhr. Joris Aelterman'], offset: 63, days: 2, closeDaysBefore: 28, closeTime: '23:59', timeZone: 'Europe/Brussels', notes: 'Abroad: crossing booked for the Thursday; check each dog\'s travel papers a month ahead.' },
  { key: 'quarrendown', name: 'Quarrendown Canine Society Championship Show', club: 'Quarrendown Canine Society', place: 'Quarrendown County Showground, Quarrendown', judges: ['Mr Leofric Daunt'], offset: 77, days: 1, closeDaysBefore: 35, closeTime: '23:59', notes: null },
  { key: 'tillowmere', name: 'Tillowmere Open Show', club: 'Tillowmere & Vale Canine Club', place: 'Tillowmere Community Centre, Tillowmere', judges: ['Ms Perpetua Yeo'], offset: 84, days: 1, closeDaysBefore: 42, closeTime: '12:00', notes: null },
  { key: 'ashcombe', name: 'Ashcombe Lees Terrier Club Open Show', club: 'Ashcombe Lees Terrier Club', place: 'Ashcombe Lees Village Hall, Ashcombe Lees', judges: ['Mrs Gwenllian Moss-Harte'], offset: 98, days: 1, closeDaysBefore: 28, closeTime: '23:59', notes: null },
  { key: 'larkmoor', name: 'Larkmoor Championship Show', club: 'Larkmoor Canine Association', place: 'Larkmoor Showground, Larkmoor', judges: ['Mr Aurelio Fenwick', 'Mrs Hester Quenby'], offset: 105, days: 2, closeDaysBefore: 35, closeTime: '23:59', notes: 'Two days: terriers on the Sunday.' },
]

// The puppy's first show: the first of shows 3-5 whose day of the month is 28 or less, so six
// calendar months before it is the same day of the month under either month-end reading.
function puppyDebut(shows: readonly StoryShow[]): number {
  const found = [3, 4, 5].find(i => Number(shows[i]!.firstDay.slice(8, 10)) <= 28)
  return found ?? 3
}

/** The Larkspur Hollow Kennel's season, relative to `today` (the kennel's date in Europe/London). */
export function buildLarkspurStory(today: ISODate): KennelStory {
  const organisation = DEMO_ORGANISATIONS.find(o => o.name === 'Larkspur Hollow Kennel')!
  const shows = planShows(saturdayAfter(today, 8), LARKSPUR_SHOWS, organisation.timeZone)
  const debut = puppyDebut(shows)
  const standard = DEFAULT_PROFILE.key
  const fast = 'fast-furnishing-wire-coat'
  const adult = (years: number, days: number) => () => ageBefore(today, years, days)
  const plans: DogPlan[] = [
    { key: 'bramble', callName: 'Bramble', registeredName: 'Larkspur Bramble Tide', registrationNumber: 'LHK-22-0417', breed: 'Wire Fox Terrier', sex: 'dog', colour: 'White with tan head markings', owner: { name: 'Hollis Pellowe', email: 'hollis.pellowe@mail.example', phone: '+44 7700 900114' }, handler: TOBIAS, profile: standard, notes: 'Stands like a statue on the table; fusses over his ears.', status: 'active', storyline: 'on-track', born: adult(3, 40), entries: [0, 3, 7, 10], classes: ['kc:limit', 'kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'quill', callName: 'Quill', registeredName: 'Quarrendown Quill of Larkspur', registrationNumber: 'QDN-21-1182', breed: 'Wire Fox Terrier', sex: 'bitch', colour: 'White, black and tan', owner: { name: 'Maren Oakhurst', email: MAREN, phone: '+44 7700 900101' }, handler: TOBIAS, profile: standard, notes: null, status: 'active', storyline: 'on-track', born: adult(4, 75), entries: [1, 4, 8], classes: ['kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'tansy', callName: 'Tansy', registeredName: 'Larkspur Tansy Bright', registrationNumber: 'LHK-23-0522', breed: 'Welsh Terrier', sex: 'bitch', colour: 'Black and tan', owner: { name: 'Greta Ashdown', email: 'greta.ashdown@post.example', phone: '+44 7700 900237' }, handler: INES, profile: fast, notes: 'Her furnishings come back fast: on the quicker profile.', status: 'active', storyline: 'on-track', born: adult(2, 100), entries: [2, 5, 9], classes: ['kc:post-graduate', 'kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'fennick', callName: 'Fennick', registeredName: 'Tillowmere Fennick', registrationNumber: 'TLM-22-0093', breed: 'Lakeland Terrier', sex: 'dog', colour: 'Red grizzle', owner: { name: 'Oswin Tarrant', email: 'oswin.tarrant@mail.example', phone: '+44 7700 900352' }, handler: TOBIAS, profile: fast, notes: null, status: 'active', storyline: 'late', born: adult(3, 200), entries: [1, 5, 11], classes: ['kc:limit', 'kc:open'], pulls: [{ from: 'show', at: -55, kind: 'strip', regions: ALL, note: 'Stripped him right out after a flea-allergy flare; the coat will come back behind.' }], care: 'show' },
    { key: 'pebble', callName: 'Pebble', registeredName: 'Brackenfold Pebble', registrationNumber: 'BKF-20-0741', breed: 'Border Terrier', sex: 'bitch', colour: 'Grizzle and tan', owner: { name: 'Linnea Fairbairn-Cole', email: 'linnea.fc@mail.example', phone: '+44 7700 900468' }, handler: INES, profile: standard, notes: null, status: 'active', storyline: 'on-track', born: adult(5, 12), entries: [3, 6, 10], classes: ['kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'rook', callName: 'Rook', registeredName: 'Hathernwick Rook at Larkspur', registrationNumber: 'HTW-21-0310', breed: 'Airedale Terrier', sex: 'dog', colour: 'Black and tan', owner: { name: 'Ambrose Keteleer', email: 'ambrose.k@post.example', phone: '+44 7700 900575' }, handler: TOBIAS, profile: standard, notes: 'Missed the show he was brought on for (lame for a week); now well again.', status: 'active', storyline: 'past-peak', born: adult(4, 300), entries: [4, 8], classes: ['kc:open'], pulls: layerAll(-95, 'Full layer, all over, for the show he then missed.'), care: 'show' },
    { key: 'saffron', callName: 'Saffron', registeredName: 'Larkspur Saffron Lane', registrationNumber: 'LHK-22-0388', breed: 'Irish Terrier', sex: 'bitch', colour: 'Red wheaten', owner: { name: 'Priya Hallorans', email: 'priya.hallorans@mail.example', phone: '+44 7700 900629' }, handler: TOBIAS, profile: standard, notes: 'Ines takes her in when Tobias has a clash.', status: 'active', storyline: 'on-track', born: adult(3, 150), entries: [{ show: 0, handler: INES }, 2, { show: 6, handler: INES }, 9], classes: ['kc:limit', 'kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'dunnock', callName: 'Dunnock', registeredName: 'Oriel Vale Dunnock', registrationNumber: 'ORV-19-0207', breed: 'Scottish Terrier', sex: 'dog', colour: 'Black', owner: { name: 'Cedric Mawdsley', email: 'cedric.mawdsley@post.example', phone: '+44 7700 900583' }, handler: null, profile: standard, notes: 'Owner-handled; boards with us before shows.', status: 'active', storyline: 'late', born: adult(6, 30), entries: [2, 6], classes: ['kc:open'], pulls: layerAll(-50, 'Back from a month away with his owner: the layer went in late.'), care: 'show' },
    { key: 'bracken', callName: 'Bracken', registeredName: 'Sallowby Bracken', registrationNumber: 'SLB-20-0456', breed: 'Wire-haired Dachshund', sex: 'dog', colour: 'Wild boar', owner: { name: 'Hollis Pellowe', email: 'hollis.pellowe@mail.example', phone: '+44 7700 900114' }, handler: TOBIAS, profile: standard, notes: null, status: 'active', storyline: 'bare', born: adult(5, 45), entries: [1, 4], classes: ['kc:open'], pulls: [...readyFor(), { from: 'today', at: -10, kind: 'strip', regions: ['rear'], note: 'Hot spot on the rump: stripped the rear short so the vet could treat it.' }], care: 'show' },
    { key: 'heddle', callName: 'Heddle', registeredName: 'Kettlewold Heddle', registrationNumber: 'KTW-23-0135', breed: 'Cairn Terrier', sex: 'bitch', colour: 'Wheaten brindle', owner: { name: 'Dervla Quist', email: 'dervla.quist@mail.example', phone: '+44 7700 900690' }, handler: INES, profile: standard, notes: 'Arrived from her breeder last week; no coat work logged yet.', status: 'active', storyline: 'no-record', born: adult(2, 20), entries: [6, 9], classes: ['kc:yearling', 'kc:open'], pulls: [], care: 'none' },
    { key: 'nutmeg', callName: 'Nutmeg', registeredName: 'Larkspur Nutmeg Fair', registrationNumber: 'LHK-21-0266', breed: 'Norfolk Terrier', sex: 'bitch', colour: 'Red', owner: { name: 'Fenella Oduya', email: 'fenella.oduya@post.example', phone: '+44 7700 900742' }, handler: INES, profile: standard, notes: null, status: 'active', storyline: 'on-track', born: adult(4, 60), entries: [4, 8, 11], classes: ['kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'sprig', callName: 'Sprig', registeredName: 'Larkspur Sprig Wildfire', registrationNumber: 'LHK-25-0611', breed: 'Wire Fox Terrier', sex: 'dog', colour: 'White with black and tan markings', owner: { name: 'Maren Oakhurst', email: MAREN, phone: '+44 7700 900101' }, handler: TOBIAS, profile: standard, notes: `Six calendar months old on the first day of ${shows[debut]!.name}: his first show.`, status: 'active', storyline: 'on-track', born: s => addCalendarMonths(s[debut]!.firstDay, -6, 'month-end'), entries: [debut, debut + 4], classes: ['kc:minor-puppy', 'kc:puppy', 'kc:junior'], pulls: layerAll(-60, 'First layer off his puppy jacket; he stood well for it.'), care: 'show' },
    { key: 'juniper', callName: 'Juniper', registeredName: 'Tillowmere Juniper Song', registrationNumber: 'TLM-24-0418', breed: 'Welsh Terrier', sex: 'bitch', colour: 'Black and tan', owner: { name: 'Oswin Tarrant', email: 'oswin.tarrant@mail.example', phone: '+44 7700 900352' }, handler: INES, profile: fast, notes: 'In Junior this season.', status: 'active', storyline: 'on-track', born: s => addCalendarMonths(s[3]!.firstDay, -14, 'month-end'), entries: [3, 6, 10], classes: ['kc:junior', 'kc:yearling'], pulls: readyFor(), care: 'show' },
    { key: 'wisp', callName: 'Wisp', registeredName: 'Brackenfold Wisp', registrationNumber: 'BKF-15-0102', breed: 'Border Terrier', sex: 'dog', colour: 'Blue and tan', owner: { name: 'Maren Oakhurst', email: MAREN, phone: '+44 7700 900101' }, handler: null, profile: standard, notes: 'Retired after his veteran year; kept short for comfort.', status: 'retired', storyline: 'retired', born: adult(10, 80), entries: [], classes: [], pulls: [{ from: 'today', at: -47, kind: 'strip', regions: ALL, note: 'Stripped short all over for the warmer weeks.' }], care: 'rest' },
    { key: 'gorse', callName: 'Gorse', registeredName: 'Hathernwick Gorse', registrationNumber: 'HTW-16-0077', breed: 'Airedale Terrier', sex: 'bitch', colour: 'Black and tan', owner: { name: 'Ambrose Keteleer', email: 'ambrose.k@post.example', phone: '+44 7700 900575' }, handler: null, profile: standard, notes: 'Retired; lives with her owner, comes in for a tidy.', status: 'retired', storyline: 'retired', born: adult(9, 200), entries: [], classes: [], pulls: [{ from: 'today', at: -33, kind: 'strip', regions: ALL, note: 'Stripped right down: she is happier short.' }], care: 'rest' },
    { key: 'thistle', callName: 'Thistle', registeredName: 'Quarrendown Thistle', registrationNumber: 'QDN-22-0954', breed: 'Lakeland Terrier', sex: 'bitch', colour: 'Black and tan', owner: { name: 'Rosamund Achterberg', email: 'rosamund.a@mail.example', phone: '+44 7700 900806' }, handler: TOBIAS, profile: fast, notes: null, status: 'active', storyline: 'on-track', born: adult(3, 10), entries: [{ show: 1, handler: INES }, { show: 3, handler: INES }, 7], classes: ['kc:post-graduate', 'kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'cobnut', callName: 'Cobnut', registeredName: 'Ashcombe Cobnut', registrationNumber: 'ASL-22-0319', breed: 'Irish Terrier', sex: 'dog', colour: 'Red', owner: { name: 'Tobiah Frane', email: 'tobiah.frane@post.example', phone: '+44 7700 900857' }, handler: INES, profile: standard, notes: null, status: 'active', storyline: 'late', born: adult(2, 250), entries: [3, 7], classes: ['kc:yearling', 'kc:open'], pulls: [
      { from: 'show', at: -62, kind: 'layer', regions: MID, note: 'Layer came late: he was off colour for a fortnight.' },
      { from: 'show', at: -55, kind: 'layer', regions: SLOW, note: 'Topline and sides at last; they will be behind.' },
      { from: 'show', at: -52, kind: 'layer', regions: EARS, note: 'Ears tidied down.' },
    ], care: 'show' },
    { key: 'inkwell', callName: 'Inkwell', registeredName: 'Oriel Vale Inkwell', registrationNumber: 'ORV-22-0288', breed: 'Scottish Terrier', sex: 'bitch', colour: 'Wheaten', owner: { name: 'Cedric Mawdsley', email: 'cedric.mawdsley@post.example', phone: '+44 7700 900583' }, handler: null, profile: standard, notes: 'Owner-handled; Ines takes her in at Fenmarsh.', status: 'active', storyline: 'on-track', born: adult(3, 120), entries: [{ show: 5, handler: INES }, 9], classes: ['kc:open'], pulls: readyFor(null), care: 'show' },
    { key: 'sorrel', callName: 'Sorrel', registeredName: 'Fenmarsh Sorrel', registrationNumber: 'FNM-18-0533', breed: 'Norfolk Terrier', sex: 'dog', colour: 'Red wheaten', owner: { name: 'Winifred Kalu-Marsh', email: 'winifred.km@mail.example', phone: '+44 7700 900918' }, handler: TOBIAS, profile: standard, notes: 'Veteran this year and still loves it.', status: 'active', storyline: 'on-track', born: () => addCalendarMonths(today, -90, 'month-end'), entries: [{ show: 2, status: 'withdrawn', notes: 'Withdrawn: his coat would not be ready in time.' }, 5, 8], classes: ['kc:veteran', 'kc:open'], pulls: readyFor(), care: 'show' },
    { key: 'tumble', callName: 'Tumble', registeredName: 'Sallowby Tumbleweed', registrationNumber: 'SLB-21-0662', breed: 'Wire-haired Dachshund', sex: 'bitch', colour: 'Red', owner: { name: 'Perrin Holloway-Sze', email: 'perrin.hs@post.example', phone: '+44 7700 900963' }, handler: INES, profile: standard, notes: null, status: 'active', storyline: 'on-track', born: adult(4, 30), entries: [2, 5, 9], classes: ['kc:open'], pulls: readyFor(-75), care: 'show' },
  ]
  const story = buildDogs(plans, { ruleSet: organisation.ruleSet, today, shows, lead: MAREN, helpers: [PIP, JUNO] })

  // A task done with coat work links to it, so the log says which task the work finished.
  const doneWork = (dog: string, kind: WorkKind, regions: string[], daysAgo: number, by: string, notes: string) => {
    story.work.push({ dog, date: addDays(today, -daysAgo), kind, regions, by, minutes: minutesFor(kind, regions), notes })
    return story.work.length - 1
  }
  const task = (t: Omit<StoryTask, 'window' | 'skipReason' | 'minutes' | 'work'> & Partial<StoryTask>): StoryTask =>
    ({ window: null, skipReason: null, minutes: null, work: null, ...t })
  const tasks: StoryTask[] = [
    task({ dog: 'bramble', kind: 'roll', regions: TIGHT, dueDate: addDays(today, 1), window: { start: '09:00', end: '10:00' }, assignee: PIP, createdBy: MAREN, status: 'open', notes: 'Keep the neck, shoulders and rear tight before his show.' }),
    task({ dog: 'inkwell', kind: 'layer', regions: EARS, dueDate: addDays(today, 3), assignee: PIP, createdBy: MAREN, status: 'open', notes: 'Ears now, so they bloom for Fenmarsh. Go gently: she is touchy about them.' }),
    task({ dog: 'rook', kind: 'card', regions: UNDERCOAT, dueDate: addDays(today, -3), assignee: PIP, createdBy: TOBIAS, status: 'open', notes: 'Undercoat is thick on the rear; card it out gently.' }),
    task({ dog: 'tansy', kind: 'bath', regions: ALL, dueDate: addDays(today, -5), assignee: PIP, createdBy: INES, status: 'done', minutes: 30, notes: 'Bath before her next roll.', work: doneWork('tansy', 'bath', ALL, 5, PIP, 'Bath done for the task; coat standing up well.') }),
    task({ dog: 'saffron', kind: 'trim', regions: FURNISHINGS, dueDate: today, window: { start: '14:00', end: '15:00' }, assignee: JUNO, createdBy: TOBIAS, status: 'in-progress', notes: 'Neaten the beard and the front; leave the eyebrows long.' }),
    task({ dog: 'quill', kind: 'roll', regions: SLOW, dueDate: addDays(today, 4), assignee: JUNO, createdBy: MAREN, status: 'open', notes: 'Light roll on the topline and sides only.' }),
    task({ dog: 'nutmeg', kind: 'card', regions: UNDERCOAT, dueDate: addDays(today, -9), assignee: JUNO, createdBy: INES, status: 'done', minutes: 15, notes: 'Card out the undercoat on the rear and neck.', work: doneWork('nutmeg', 'card', UNDERCOAT, 9, JUNO, 'Carded the rear and neck for the task; skin fine.') }),
    task({ dog: 'cobnut', kind: 'bath', regions: ALL, dueDate: addDays(today, -6), assignee: JUNO, createdBy: INES, status: 'skipped', skipReason: 'He was off colour; left him to rest.', notes: 'Bath before the weekend.' }),
  ]
  return { organisation: organisation.name, ruleSet: organisation.ruleSet, timeZone: organisation.timeZone, today, profiles: storedProfiles(), shows, ...story, tasks }
}

const NORTHFOLD_SHOWS: ShowPlan[] = [
  { key: 'members', name: 'Northfold Wire Terrier Club Members\' Show', club: 'Northfold Wire Terrier Club', place: 'Kilbrannock Parish Hall, Kilbrannock', judges: ['Mr Fergal Ashdown-Reilly'], offset: 0, days: 1, closeDaysBefore: 28, closeTime: '23:59', notes: null },
  { key: 'championship', name: 'Northfold Wire Terrier Club Championship Show', club: 'Northfold Wire Terrier Club', place: 'Drumcarrow Showgrounds, Drumcarrow', judges: ['Mrs Orla Brennagh', 'Mr Ivo Castellane'], offset: 49, days: 2, closeDaysBefore: 35, closeTime: '23:59', notes: 'Club\'s big weekend: help needed with the raffle.' },
]

/** The Northfold Wire Terrier Club's few dogs and shows, so that another organisation's ids exist. */
export function buildNorthfoldStory(today: ISODate): KennelStory {
  const organisation = DEMO_ORGANISATIONS.find(o => o.name === 'Northfold Wire Terrier Club')!
  const shows = planShows(saturdayAfter(today, 20), NORTHFOLD_SHOWS, organisation.timeZone)
  const standard = DEFAULT_PROFILE.key
  const plans: DogPlan[] = [
    { key: 'corran', callName: 'Corran', registeredName: 'Ballycreel Corran', registrationNumber: 'BCR-22-0031', breed: 'Wire Fox Terrier', sex: 'dog', colour: 'White and tan', owner: { name: 'Siobhan Larkin-Hale', email: 'siobhan.lh@mail.example', phone: '+44 7700 900811' }, handler: MAREN, profile: standard, notes: null, status: 'active', storyline: null, born: () => ageBefore(today, 3, 70), entries: [0, 1], classes: ['fci:open'], pulls: readyFor(), care: 'show' },
    { key: 'fiadh', callName: 'Fiadh', registeredName: 'Drumcarrow Fiadh', registrationNumber: 'DRC-24-0107', breed: 'Irish Terrier', sex: 'bitch', colour: 'Red', owner: { name: 'Eamon Tiernagh', email: 'eamon.tiernagh@post.example', phone: '+44 7700 900824' }, handler: null, profile: standard, notes: 'Owner-handled.', status: 'active', storyline: null, born: () => addCalendarMonths(today, -20, 'month-end'), entries: [0, 1], classes: ['fci:intermediate', 'fci:junior', 'fci:open'], pulls: layerAll(-50, 'Layer went in late after her season.'), care: 'show' },
    { key: 'tadhg', callName: 'Tadhg', registeredName: 'Ballycreel Tadhg', registrationNumber: 'BCR-20-0012', breed: 'Welsh Terrier', sex: 'dog', colour: 'Black and tan', owner: { name: 'Siobhan Larkin-Hale', email: 'siobhan.lh@mail.example', phone: '+44 7700 900811' }, handler: MAREN, profile: standard, notes: null, status: 'active', storyline: null, born: () => ageBefore(today, 5, 100), entries: [1], classes: ['fci:open'], pulls: readyFor(), care: 'show' },
  ]
  const story = buildDogs(plans, { ruleSet: organisation.ruleSet, today, shows, lead: CORRIE, helpers: [CORRIE, MAREN] })
  return { organisation: organisation.name, ruleSet: organisation.ruleSet, timeZone: organisation.timeZone, today, profiles: storedProfiles().filter(p => p.isDefault), shows, ...story, tasks: [] }
}

const STORIES: [string, (today: ISODate) => KennelStory][] = [
  ['Larkspur Hollow Kennel', buildLarkspurStory],
  ['Northfold Wire Terrier Club', buildNorthfoldStory],
]

/** Both organisations' stories for an instant, each relative to its own 'today'. */
export function buildDemoStories(now: Date = new Date()): KennelStory[] {
  return STORIES.map(([name, build]) => build(todayInTimeZone(DEMO_ORGANISATIONS.find(o => o.name === name)!.timeZone, now)))
}

/** The ids seedDemo has made: organisations by name, people by e-mail. */
export interface DemoPeople {
  organisations: ReadonlyMap<string, number>
  users: ReadonlyMap<string, number>
}

function idOf(map: ReadonlyMap<string, number>, key: string, what: string): number {
  const id = map.get(key)
  if (id === undefined) throw new Error(`The demo story names ${what} ${JSON.stringify(key)}, which was not created`)
  return id
}

async function insertStory(story: KennelStory, people: DemoPeople, now: Date, transaction: Transaction): Promise<void> {
  const organisationId = idOf(people.organisations, story.organisation, 'the organisation')
  const person = (email: string | null) => (email === null ? null : idOf(people.users, email, 'the person'))
  const evening = (date: ISODate) => new Date(Math.min(now.getTime(), wallClockToInstant(date, '18:00', story.timeZone).getTime()))

  const profiles = await CoatProfileRow.bulkCreate(story.profiles.map(p => ({ organisationId, ...p })), { transaction, returning: true })
  const profileIds = new Map(profiles.map(p => [p.key, p.id]))
  const dogs = await Dog.bulkCreate(story.dogs.map(({ key: _key, storyline: _storyline, owner, handler, profile, ...d }) => ({
    organisationId,
    ...d,
    ownerName: owner.name,
    ownerEmail: owner.email,
    ownerPhone: owner.phone,
    handlerId: person(handler),
    coatProfileId: idOf(profileIds, profile, 'the coat profile'),
  })), { transaction, returning: true })
  const dogIds = new Map(story.dogs.map((d, i) => [d.key, dogs[i]!.id]))
  const work = await CoatWorkRow.bulkCreate(story.work.map(w => ({
    organisationId,
    dogId: idOf(dogIds, w.dog, 'the dog'),
    date: w.date,
    kind: w.kind,
    regions: w.regions,
    workedById: person(w.by),
    recordedById: person(w.by),
    minutes: w.minutes,
    notes: w.notes,
    taskId: null,
    deletedById: null,
    createdAt: evening(w.date),
    updatedAt: evening(w.date),
  })), { transaction, returning: true })
  const shows = await Show.bulkCreate(story.shows.map(({ key: _key, entriesClose, ...s }) => ({
    organisationId,
    ...s,
    entriesCloseAt: wallClockToInstant(entriesClose.date, entriesClose.time, s.timeZone),
  })), { transaction, returning: true })
  const showIds = new Map(story.shows.map((s, i) => [s.key, shows[i]!.id]))
  const closesAt = new Map(story.shows.map((s, i) => [s.key, shows[i]!.entriesCloseAt]))
  // Entered ten days before entries closed (or now, if that is earlier): a kennel enters in time,
  // and only an entry made late should carry the "entered after entries closed" warning.
  const enteredAt = (show: string) => {
    const close = closesAt.get(show)
    return new Date(Math.min(now.getTime(), close ? close.getTime() - 10 * 86_400_000 : now.getTime()))
  }
  await Entry.bulkCreate(story.entries.map(e => ({
    organisationId,
    createdAt: enteredAt(e.show),
    updatedAt: enteredAt(e.show),
    dogId: idOf(dogIds, e.dog, 'the dog'),
    showId: idOf(showIds, e.show, 'the show'),
    classCode: e.classCode,
    armband: e.armband,
    status: e.status,
    handlerId: person(e.handler),
    notes: e.notes,
  })), { transaction })
  const tasks = await Task.bulkCreate(story.tasks.map(t => ({
    organisationId,
    dogId: idOf(dogIds, t.dog, 'the dog'),
    kind: t.kind,
    regions: t.regions,
    dueDate: t.dueDate,
    windowStart: t.window?.start ?? null,
    windowEnd: t.window?.end ?? null,
    assigneeId: person(t.assignee),
    createdById: person(t.createdBy),
    status: t.status,
    skipReason: t.skipReason,
    minutes: t.minutes,
    notes: t.notes,
    planStepKey: null,
    coatWorkId: t.work === null ? null : work[t.work]!.id,
    doneAt: t.status === 'done' && t.work !== null ? evening(story.work[t.work]!.date) : null,
  })), { transaction, returning: true })
  for (const [i, t] of story.tasks.entries()) {
    if (t.work !== null) await CoatWorkRow.update({ taskId: tasks[i]!.id }, { where: { id: work[t.work]!.id }, transaction })
  }
}

/** Loads both organisations' coat profiles, dogs, coat work, shows, entries and tasks inside seedDemo's transaction. */
export async function seedKennel(sequelize: Sequelize, transaction: Transaction, people: DemoPeople, now: Date = new Date()): Promise<void> {
  initModels(sequelize)
  for (const story of buildDemoStories(now)) await insertStory(story, people, now, transaction)
}
