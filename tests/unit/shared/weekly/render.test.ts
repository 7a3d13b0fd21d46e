import { describe, expect, it } from 'vitest'
import { COAT_CAUTIONS, RULE_SET_INFO } from '../../../../shared/coat'
import { dateInWords, listInWords, regionsToWork, renderWeeklyStatus, type WeeklyStatus, type WeeklyTask } from '../../../../shared/weekly'

// An invented kennel, people and dogs (DESIGN.md: demo data is invented); `.example` is reserved (RFC 2606 §3).
const links = {
  app: 'https://bloomline.example/',
  unsubscribePage: 'https://bloomline.example/unsubscribe/7-3-abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQ',
  oneClick: 'https://bloomline.example/api/public/unsubscribe/7-3-abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQ',
}

const task = (over: Partial<WeeklyTask>): WeeklyTask => ({
  id: 1, dueDate: '2026-12-03', dogId: 11, dogCallName: 'Marram', kind: 'roll', regionLabels: ['Neck', 'Rear'],
  assigneeName: 'Sable Quince', status: 'open', windowStart: null, windowEnd: null, notes: null, ...over,
})

const status: WeeklyStatus = {
  week: '2026-W49',
  weekStart: '2026-11-30',
  weekEnd: '2026-12-06',
  today: '2026-11-30',
  organisation: { name: 'Fernbrake Wire Kennel', timeZone: 'Europe/London', ruleSet: 'KC' },
  recipient: { name: 'Odile Marsh', role: 'handler' },
  dogs: [
    { id: 11, callName: 'Marram', breed: 'Wire Fox Terrier', handlerName: 'Wren Halloway', nextShow: { name: 'Saltings Open Show', firstDay: '2026-12-12', inDays: 12 }, score: 93, onTrack: true, weakest: [{ label: 'Sides', state: 'coming-in', score: 71 }] },
    { id: 12, callName: 'Tarn <b>', breed: 'Lakeland Terrier', handlerName: null, nextShow: { name: 'Saltings Open Show', firstDay: '2026-12-12', inDays: 12 }, score: 48, onTrack: false, weakest: [{ label: 'Rear', state: 'bare', score: 0 }, { label: 'Ears', state: 'no-record', score: 0 }] },
    { id: 13, callName: 'Wick', breed: 'Welsh Terrier', handlerName: 'Odile Marsh', nextShow: { name: 'Holloway Championship Show', firstDay: '2027-01-09', inDays: 40 }, score: 100, onTrack: true, weakest: [] },
    { id: 14, callName: 'Bothy', breed: 'Border Terrier', handlerName: 'Odile Marsh', nextShow: null, score: null, onTrack: null, weakest: [] },
  ],
  planSteps: [
    { date: '2026-11-30', dogId: 13, dogCallName: 'Wick', kind: 'bath', regionLabels: ['Head', 'Ears', 'Neck', 'Topline', 'Sides'], note: 'Bath so the coat stands up for the layer.' },
    { date: '2026-12-01', dogId: 13, dogCallName: 'Wick', kind: 'layer', regionLabels: ['Topline', 'Sides'], note: 'Last day to touch the sides for Holloway.' },
  ],
  tasks: [task({ id: 2, windowStart: '09:00', windowEnd: '10:00', notes: 'Keep the neck tight.' })],
  overdue: [task({ id: 3, dueDate: '2026-11-27', dogId: 12, dogCallName: 'Tarn <b>', kind: 'card', regionLabels: ['Rear'], status: 'in-progress', assigneeName: null })],
  closingSoon: [{ showName: 'Holloway Championship Show', firstDay: '2027-01-09', closes: { date: '2026-12-08', time: '23:59' }, timeZone: 'Europe/London', closesInDays: 8, entryCount: 2 }],
  classWarnings: [{ dogCallName: 'Wick', showName: 'Holloway Championship Show', showFirstDay: '2027-01-09', classLabel: 'Junior', message: 'Wick is not eligible for Junior by age on the show\'s first day, 2027-01-09.' }],
  links,
}

/** The text a reader sees in the HTML part, tags dropped and entities read back. */
function visibleText(html: string): string {
  return html.replace(/<div style="display:none[^]*?<\/div>/, '').replace(/<[^>]+>/g, ' ')
    .replace(/&#10003;|&#9670;|&#9679;/g, ' ').replace(/&nbsp;/g, ' ')
    .replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, '\'').replace(/&amp;/g, '&')
    .replace(/\s+/g, ' ')
}

describe('renderWeeklyStatus for a handler', () => {
  const message = renderWeeklyStatus(status)
  const seen = visibleText(message.html)

  it('names the ISO week and the organisation in the subject, with the dogs on track', () => {
    // Marram and Wick are on track; Bothy has no show ahead and is not counted.
    expect(message.subject).toBe('Week 49 at Fernbrake Wire Kennel: 2 of 3 dogs on track')
  })

  it('opens with a summary of the week in one sentence', () => {
    expect(message.text).toContain('2 of 3 dogs on track for their next show (and 1 with no show ahead); 2 plan steps and 1 task this week; 1 task overdue; entries close for 1 show within 14 days.')
  })

  it('lists the dogs in order of their next show, in both parts', () => {
    for (const part of [seen, message.text]) {
      const at = ['Marram', 'Tarn <b>', 'Wick', 'Bothy'].map(name => part.indexOf(name))
      expect(at.every(i => i >= 0)).toBe(true)
      expect([...at].sort((a, b) => a - b)).toEqual(at)
    }
    // A dog's handler is named, unless it is the reader.
    expect(message.text).toContain('- Marram (Wire Fox Terrier, Wren Halloway): 93, on track')
    expect(message.text).toContain('- Wick (Welsh Terrier): 100, on track')
    expect(message.text).toContain('- Tarn <b> (Lakeland Terrier): 48, not on track')
    expect(message.text).toContain('  Weakest: Rear bare (0), Ears no record')
    expect(message.text).toContain('Not entered in a show: Bothy')
    expect(seen).toContain('Saltings Open Show Saturday 12 December, in 12 days · 1 of 2 on track')
  })

  it('says on track or not in words, not by colour alone', () => {
    expect(seen).toMatch(/Marram .*93 On track/)
    expect(seen).toMatch(/Tarn <b> .*48 Not on track/)
    expect(seen).toContain('Rear: bare 0')
  })

  it('escapes what people typed', () => {
    expect(message.html).not.toContain('Tarn <b>')
    expect(message.html).toContain('Tarn &lt;b&gt;')
  })

  it('gathers the regions that need work this week from the plan and the open tasks', () => {
    expect(regionsToWork(status)).toEqual([
      { dogId: 11, dogCallName: 'Marram', work: [{ kind: 'roll', regionLabels: ['Neck', 'Rear'] }] },
      { dogId: 12, dogCallName: 'Tarn <b>', work: [{ kind: 'card', regionLabels: ['Rear'] }] },
      { dogId: 13, dogCallName: 'Wick', work: [{ kind: 'layer', regionLabels: ['Topline', 'Sides'] }] },
    ])
    expect(message.text).toContain('- Wick: Layer: topline and sides')
  })

  it('says a bath is for the whole coat, and counts it as no region\'s need', () => {
    expect(message.text).toContain('- Mon 30 Nov: Wick, Bath (the whole coat)')
    expect(regionsToWork(status).find(d => d.dogId === 13)!.work.map(w => w.kind)).toEqual(['layer'])
  })

  it('lists the week\'s plan steps, tasks, overdue tasks and closing entries', () => {
    expect(message.text).toContain('- Tue 1 Dec: Wick, Layer: topline and sides\n  Last day to touch the sides for Holloway.')
    expect(message.text).toContain('- Thu 3 Dec, 09:00–10:00: Marram, Roll: neck and rear (Sable Quince, to do)\n  Keep the neck tight.')
    expect(message.text).toContain('OVERDUE TASKS\n-------------\n- Fri 27 Nov: Tarn <b>, Card: rear (nobody yet, in progress)')
    expect(message.text).toContain('- Holloway Championship Show: entries close Tue 8 Dec at 23:59 (Europe/London time), in 8 days\n  First day Saturday 9 January; 2 entries of your dogs.')
  })

  it('names the rule set of the class checks and defers to the show\'s schedule (DESIGN.md §7)', () => {
    expect(message.text).toContain('- Wick, Junior at Holloway Championship Show (Sat 9 Jan):')
    for (const part of [seen, message.text]) {
      expect(part).toContain(RULE_SET_INFO.KC.label)
      expect(part).toContain('The show schedule decides.')
    }
  })

  it('shows the coat-work cautions, veterinarian included, where it prompts coat work (DESIGN.md §7)', () => {
    for (const caution of COAT_CAUTIONS) {
      expect(seen).toContain(caution)
      expect(message.text).toContain(`- ${caution}`)
    }
    expect(message.text).toMatch(/ask a veterinarian/i)
  })

  it('renders well in mail clients: tables and inline styles, no remote images, fonts or style sheets', () => {
    expect(message.html).toMatch(/^<!DOCTYPE html>/)
    expect(message.html).toContain('<table role="presentation"')
    expect(message.html).not.toMatch(/<img|<link|<script|<style|url\(|@import/i)
    expect(message.html).not.toMatch(/class="/)
  })

  it('carries the links in full on their own lines in the text part', () => {
    const lines = message.text.split('\n')
    expect(lines).toContain(links.app)
    expect(lines).toContain(links.unsubscribePage)
    expect(message.html).toContain(`href="${links.unsubscribePage}"`)
  })

  it('has the one-click unsubscribe headers of RFC 8058 §3.1 and RFC 3834\'s Auto-Submitted', () => {
    // RFC 8058 §3.1: List-Unsubscribe holds one HTTPS URI in angle brackets (RFC 2369), and
    // List-Unsubscribe-Post exactly the key/value "List-Unsubscribe=One-Click".
    expect(message.headers).toEqual({
      'List-Unsubscribe': `<${links.oneClick}>`,
      'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click',
      'Auto-Submitted': 'auto-generated',
    })
  })
})

describe('renderWeeklyStatus for an assistant', () => {
  const message = renderWeeklyStatus({ ...status, recipient: { name: 'Sable Quince', role: 'assistant' }, dogs: [], planSteps: [], closingSoon: [], classWarnings: [] })

  it('holds their tasks, not the kennel\'s dogs, entries or class checks', () => {
    expect(message.subject).toBe('Week 49 at Fernbrake Wire Kennel: 1 task for you, 1 overdue')
    expect(message.text).toContain('YOUR TASKS THIS WEEK')
    expect(message.text).toContain('- Thu 3 Dec, 09:00–10:00: Marram, Roll: neck and rear (to do)')
    for (const absent of ['DOGS BY THEIR NEXT SHOW', 'ENTRIES CLOSING', 'CLASS WARNINGS', RULE_SET_INFO.KC.label]) expect(message.text).not.toContain(absent)
    expect(message.text).toContain(COAT_CAUTIONS[3])
    expect(message.text).toContain('as an assistant of Fernbrake Wire Kennel')
  })
})

describe('a week with no coat work to prompt', () => {
  it('leaves the cautions out and says each list is empty', () => {
    const message = renderWeeklyStatus({ ...status, planSteps: [], tasks: [], overdue: [], closingSoon: [], classWarnings: [] })
    expect(message.text).not.toContain('BEFORE YOU WORK A COAT')
    expect(message.text).toContain('No plan steps fall this week.')
    expect(message.text).toContain('Nothing is overdue.')
    expect(message.text).toContain('No entries close in the next 14 days.')
  })
})

describe('words', () => {
  it.each([
    // 2026-12-31 is a Thursday (DESIGN.md §6: 2026-W53-4).
    ['2026-12-31', 'short', 'Thu 31 Dec'],
    ['2026-12-31', 'long', 'Thursday 31 December'],
    ['2027-01-04', 'full', 'Monday 4 January 2027'],
  ] as const)('%s reads %s as "%s"', (date, style, words) => {
    expect(dateInWords(date, style)).toBe(words)
  })

  it.each([[[], ''], [['neck'], 'neck'], [['neck', 'rear'], 'neck and rear'], [['neck', 'shoulders', 'rear'], 'neck, shoulders and rear']])('%j', (items, words) => {
    expect(listInWords(items)).toBe(words)
  })
})
