import { COAT_CAUTIONS, RULE_SET_INFO, type ISODate, type WorkKind } from '../coat'
import { escapeHtml, mailButton, mailHeading, mailLayout, mailParagraph, mailSmallPrint } from '../mail/layout'
import { STATE_LOOKS } from '../states'
import { WORK_KIND_LABELS } from '../types/kennel'
import { isoWeekNumber } from './schedule'
import type { WeeklyDog, WeeklyStatus, WeeklyStatusMessage, WeeklyTask } from './types'

// The weekly status as a message. The HTML follows shared/mail/layout.ts (tables, inline styles,
// no remote images); the text part is written for reading, not stripped from the HTML. Every
// state is a word as well as a colour, so it reads in black and white.

const INK = '#2c2619'
const MUTED = '#5e5340'
const RULE = '#e9e0cc'
const SANS = 'Helvetica, Arial, sans-serif'

const TASK_WORDS = { 'open': 'to do', 'in-progress': 'in progress', 'done': 'done', 'skipped': 'skipped' } as const

const dateFormats = {
  short: new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short' }),
  long: new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'long', day: 'numeric', month: 'long' }),
  full: new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }),
}

/** A calendar date in words: `short` "Wed 2 Dec", `long` "Wednesday 2 December", `full` with the year. */
export function dateInWords(date: ISODate, style: keyof typeof dateFormats = 'long'): string {
  // Noon UTC of the date, formatted in UTC: the calendar day itself, whatever the machine's zone.
  return dateFormats[style].format(new Date(`${date}T12:00:00Z`)).replace(/,/g, '')
}

/** A list in words: "neck, shoulders and rear". */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join('')
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`
}

function inDays(days: number): string {
  return days === 0 ? 'today' : days === 1 ? 'tomorrow' : `in ${days} days`
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`
}

// A name or title on one line: a line break typed into it must not reach a header or the text layout.
function singleLine(text: string): string {
  return text.replace(/\s+/g, ' ').trim()
}

function kindWord(kind: WorkKind): string {
  return WORK_KIND_LABELS[kind].word
}

/** One dog's regions to work this week, gathered from its plan steps and tasks, by work kind. */
export interface RegionsToWork {
  dogId: number
  dogCallName: string
  work: { kind: WorkKind, regionLabels: string[] }[]
}

/** The regions that need work this week: per dog, the regions its plan steps and open tasks of the week name, by work kind (baths left out). */
export function regionsToWork(status: Pick<WeeklyStatus, 'planSteps' | 'tasks' | 'overdue'>): RegionsToWork[] {
  const byDog = new Map<number, { dogCallName: string, kinds: Map<WorkKind, Set<string>> }>()
  const add = (dogId: number, dogCallName: string, kind: WorkKind, labels: readonly string[]) => {
    const dog = byDog.get(dogId) ?? { dogCallName, kinds: new Map() }
    const regions = dog.kinds.get(kind) ?? new Set<string>()
    for (const label of labels) regions.add(label)
    dog.kinds.set(kind, regions)
    byDog.set(dogId, dog)
  }
  // A bath is for the whole coat, to work the next layer in; it is no region's need.
  for (const step of status.planSteps) if (step.kind !== 'bath') add(step.dogId, step.dogCallName, step.kind, step.regionLabels)
  for (const task of [...status.overdue, ...status.tasks]) {
    if (task.kind !== 'bath' && (task.status === 'open' || task.status === 'in-progress')) add(task.dogId, task.dogCallName, task.kind, task.regionLabels)
  }
  return [...byDog.entries()]
    .map(([dogId, d]) => ({ dogId, dogCallName: d.dogCallName, work: [...d.kinds].map(([kind, labels]) => ({ kind, regionLabels: [...labels] })) }))
    .sort((a, b) => a.dogCallName.localeCompare(b.dogCallName, 'en'))
}

interface ShowGroup {
  show: NonNullable<WeeklyDog['nextShow']>
  dogs: WeeklyDog[]
}

function groupByShow(dogs: readonly WeeklyDog[]): { groups: ShowGroup[], noShow: WeeklyDog[] } {
  const groups: ShowGroup[] = []
  const noShow: WeeklyDog[] = []
  for (const dog of dogs) {
    if (!dog.nextShow) {
      noShow.push(dog)
      continue
    }
    const last = groups[groups.length - 1]
    // The dogs come in order of their next show, so one show's dogs are next to each other.
    if (last && last.show.name === dog.nextShow.name && last.show.firstDay === dog.nextShow.firstDay) last.dogs.push(dog)
    else groups.push({ show: dog.nextShow, dogs: [dog] })
  }
  return { groups, noShow }
}

// The dog's handler, when it is not the reader: a handler need not read their own name on every line.
function otherHandler(status: WeeklyStatus, dog: WeeklyDog): string | null {
  return dog.handlerName && dog.handlerName !== status.recipient.name ? dog.handlerName : null
}

function readinessWords(dog: WeeklyDog): string {
  if (dog.score === null || dog.onTrack === null) return 'no show ahead'
  return `${dog.score}, ${dog.onTrack ? 'on track' : 'not on track'}`
}

function weakestWords(dog: WeeklyDog): string {
  return dog.weakest.map(w => `${w.label} ${STATE_LOOKS[w.state].word.toLowerCase()}${w.state === 'no-record' ? '' : ` (${w.score})`}`).join(', ')
}

function workWords(kind: WorkKind, labels: readonly string[]): string {
  if (kind === 'bath') return 'Bath (the whole coat)'
  return `${kindWord(kind)}: ${listInWords(labels.map(l => l.toLowerCase()))}`
}

function taskWindow(task: WeeklyTask): string | null {
  return task.windowStart && task.windowEnd ? `${task.windowStart}–${task.windowEnd}` : null
}

function taskWhen(task: WeeklyTask): string {
  const window = taskWindow(task)
  return `${dateInWords(task.dueDate, 'short')}${window ? `, ${window}` : ''}`
}

function taskWho(task: WeeklyTask, assistant: boolean): string {
  const who = assistant ? '' : task.assigneeName ? `${singleLine(task.assigneeName)}, ` : 'nobody yet, '
  return `${who}${TASK_WORDS[task.status]}`
}

// HTML pieces. Every value from the database goes through escapeHtml.
const e = (text: string) => escapeHtml(singleLine(text))

function htmlRows(rows: { when: string, what: string, detail?: string }[]): string {
  const body = rows.map(r => `<tr>`
    + `<td valign="top" width="76" style="width:76px;padding:8px 10px 8px 0;border-bottom:1px solid ${RULE};font-family:${SANS};font-size:14px;line-height:20px;color:${MUTED};white-space:nowrap;">${r.when}</td>`
    + `<td valign="top" style="padding:8px 0;border-bottom:1px solid ${RULE};font-family:${SANS};font-size:14px;line-height:20px;color:${INK};">${r.what}`
    + (r.detail ? `<br><span style="font-size:13px;line-height:19px;color:${MUTED};">${r.detail}</span>` : '')
    + `</td></tr>`).join('')
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="border-collapse:collapse;margin:0 0 12px 0;">${body}</table>`
}

function htmlNone(text: string): string {
  return mailParagraph(`<span style="color:${MUTED};">${escapeHtml(text)}</span>`)
}

function htmlVerdict(dog: WeeklyDog): string {
  if (dog.score === null || dog.onTrack === null) {
    return `<span style="font-family:${SANS};font-size:13px;color:${MUTED};">No show ahead</span>`
  }
  const look = dog.onTrack
    ? { mark: '&#10003;', word: 'On track', fg: '#1b3a2f', bg: '#eef5f0', border: '#84b596' }
    : { mark: '&#9670;', word: 'Not on track', fg: '#8f3a19', bg: '#fbe7dd', border: '#eea98a' }
  return `<span style="font-family:Georgia, 'Times New Roman', serif;font-size:22px;line-height:26px;color:#24463a;">${dog.score}</span><br>`
    + `<span style="display:inline-block;margin-top:2px;padding:1px 6px;border:1px solid ${look.border};border-radius:4px;background:${look.bg};font-family:${SANS};font-size:12px;line-height:18px;font-weight:bold;color:${look.fg};white-space:nowrap;">${look.mark} ${look.word}</span>`
}

function htmlWeakest(dog: WeeklyDog): string {
  if (!dog.weakest.length) return ''
  const items = dog.weakest.map((w) => {
    const look = STATE_LOOKS[w.state]
    // No-break spaces keep "● Sides" and "coming in 29" each on one line on a narrow screen.
    const state = `${escapeHtml(look.word.toLowerCase())}${w.state === 'no-record' ? '' : ` ${w.score}`}`.replace(/ /g, '&nbsp;')
    return `<span style="color:${look.colour};">&#9679;</span>&nbsp;${e(w.label)}: ${state}`
  })
  return `<br><span style="font-size:13px;line-height:19px;color:${MUTED};">Weakest: ${items.join(', ')}</span>`
}

function htmlDogs(status: WeeklyStatus): string {
  if (!status.dogs.length) return htmlNone(status.recipient.role === 'manager' ? 'No active dogs yet.' : 'No active dogs are yours to handle yet.')
  const { groups, noShow } = groupByShow(status.dogs)
  const parts: string[] = []
  for (const group of groups) {
    const onTrack = group.dogs.filter(d => d.onTrack).length
    parts.push(`<p style="margin:14px 0 2px 0;font-family:${SANS};font-size:15px;line-height:21px;color:${INK};"><strong>${e(group.show.name)}</strong><br>`
      + `<span style="font-size:13px;color:${MUTED};">${escapeHtml(dateInWords(group.show.firstDay))}, ${inDays(group.show.inDays)} · ${onTrack} of ${group.dogs.length} on track</span></p>`)
    const rows = group.dogs.map(dog => `<tr>`
      + `<td valign="top" style="padding:8px 8px 8px 0;border-bottom:1px solid ${RULE};font-family:${SANS};font-size:15px;line-height:21px;color:${INK};">`
      + `<strong>${e(dog.callName)}</strong><br><span style="font-size:13px;line-height:19px;color:${MUTED};">${e(dog.breed)}${otherHandler(status, dog) ? ` · ${e(otherHandler(status, dog)!)}` : ''}</span>${htmlWeakest(dog)}</td>`
      + `<td valign="top" align="right" width="104" style="width:104px;padding:8px 0;border-bottom:1px solid ${RULE};text-align:right;">${htmlVerdict(dog)}</td></tr>`).join('')
    parts.push(`<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="border-collapse:collapse;margin:0 0 6px 0;">${rows}</table>`)
  }
  if (noShow.length) {
    parts.push(mailParagraph(`<strong>Not entered in a show:</strong> ${noShow.map(d => e(d.callName)).join(', ')}`))
  }
  return parts.join('\n')
}

function htmlCautions(): string {
  const items = COAT_CAUTIONS.map(c => `<li style="margin:0 0 4px 0;">${escapeHtml(c)}</li>`).join('')
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="margin:18px 0 14px 0;"><tr>`
    + `<td style="padding:12px 16px;background:#fbe7dd;border-left:4px solid #c4562a;border-radius:6px;font-family:${SANS};font-size:14px;line-height:20px;color:${INK};">`
    + `<strong style="color:#8f3a19;">Before you work a coat</strong>`
    + `<ul style="margin:6px 0 0 0;padding:0 0 0 18px;">${items}</ul></td></tr></table>`
}

function introLine(status: WeeklyStatus): string {
  const range = `${dateInWords(status.weekStart)} to ${dateInWords(status.weekEnd, 'full')}`
  if (status.recipient.role === 'assistant') return `Your coat-work tasks at ${singleLine(status.organisation.name)} for the week of ${range}.`
  const whose = status.recipient.role === 'manager' ? 'every active dog' : 'the dogs you handle'
  return `Where ${whose} at ${singleLine(status.organisation.name)} stand${status.recipient.role === 'manager' ? 's' : ''} for the week of ${range}.`
}

function count(n: number, one: string, many = `${one}s`): string {
  return n === 0 ? `no ${many}` : plural(n, one, many)
}

function summaryLine(status: WeeklyStatus): string {
  const parts: string[] = []
  if (status.recipient.role === 'assistant') {
    parts.push(`${count(status.tasks.length, 'task')} for you this week`)
  }
  else {
    const scored = status.dogs.filter(d => d.onTrack !== null)
    const noShow = status.dogs.length - scored.length
    parts.push(`${scored.filter(d => d.onTrack).length} of ${plural(scored.length, 'dog')} on track for ${scored.length === 1 ? 'its' : 'their'} next show`
      + (noShow ? ` (and ${noShow} with no show ahead)` : ''))
    parts.push(`${count(status.planSteps.length, 'plan step')} and ${count(status.tasks.length, 'task')} this week`)
  }
  parts.push(status.overdue.length ? `${plural(status.overdue.length, 'task')} overdue` : 'nothing overdue')
  if (status.recipient.role !== 'assistant' && status.closingSoon.length) {
    parts.push(`entries close for ${plural(status.closingSoon.length, 'show')} within 14 days`)
  }
  const sentence = parts.join('; ')
  return `${sentence[0]!.toUpperCase()}${sentence.slice(1)}.`
}

function subjectOf(status: WeeklyStatus): string {
  const head = `Week ${isoWeekNumber(status.week)} at ${singleLine(status.organisation.name)}`
  if (status.recipient.role === 'assistant') return `${head}: ${plural(status.tasks.length, 'task')} for you${status.overdue.length ? `, ${status.overdue.length} overdue` : ''}`
  const scored = status.dogs.filter(d => d.onTrack !== null)
  return `${head}: ${scored.filter(d => d.onTrack).length} of ${plural(scored.length, 'dog')} on track`
}

function entriesWords(status: WeeklyStatus, count: number): string {
  return `${plural(count, 'entry', 'entries')}${status.recipient.role === 'handler' ? ` of your ${count === 1 ? 'dog' : 'dogs'}` : ''}`
}

function closingWords(status: WeeklyStatus, c: WeeklyStatus['closingSoon'][number]): { when: string, what: string, detail: string } {
  return {
    when: escapeHtml(dateInWords(c.closes.date, 'short')),
    what: `<strong>${e(c.showName)}</strong>: entries close at ${escapeHtml(c.closes.time)} (${e(c.timeZone)} time), ${inDays(c.closesInDays)}`,
    detail: `First day ${escapeHtml(dateInWords(c.firstDay))} · ${escapeHtml(entriesWords(status, c.entryCount))}`,
  }
}

/**
 * The weekly status as a message: the subject, a whole HTML document and a plain-text part, and
 * the RFC 8058 one-click unsubscribe headers (List-Unsubscribe with the HTTPS address to POST to,
 * List-Unsubscribe-Post) with RFC 3834's Auto-Submitted, so auto-responders stay quiet.
 */
export function renderWeeklyStatus(status: WeeklyStatus): WeeklyStatusMessage {
  const assistant = status.recipient.role === 'assistant'
  const toWork = regionsToWork(status)
  const promptsWork = toWork.length > 0 || status.planSteps.length > 0 || status.tasks.length > 0 || status.overdue.length > 0
  const greeting = `Hello ${singleLine(status.recipient.name).split(' ')[0] || 'there'},`
  const title = `Week ${isoWeekNumber(status.week)} at ${singleLine(status.organisation.name)}`
  const intro = introLine(status)
  const summary = summaryLine(status)

  const html: string[] = [
    mailParagraph(escapeHtml(greeting)),
    mailParagraph(escapeHtml(intro)),
    mailParagraph(`<strong>${escapeHtml(summary)}</strong>`),
  ]
  if (!assistant) {
    html.push(mailHeading('Dogs by their next show'))
    html.push(mailSmallPrint('Readiness out of 100 for the first day of each dog\'s next show, and its weakest regions with their own scores.'))
    html.push(htmlDogs(status))
  }
  html.push(mailHeading('Regions that need work this week'))
  html.push(toWork.length
    ? htmlRows(toWork.map(d => ({ when: `<strong style="color:${INK};">${e(d.dogCallName)}</strong>`, what: d.work.map(w => escapeHtml(workWords(w.kind, w.regionLabels))).join('<br>') })))
    : htmlNone(assistant ? 'No coat work is asked of you this week.' : 'No region needs work this week by the plan or the tasks.'))
  if (!assistant) {
    html.push(mailHeading('This week\'s plan'))
    html.push(status.planSteps.length
      ? htmlRows(status.planSteps.map(s => ({ when: escapeHtml(dateInWords(s.date, 'short')), what: `<strong>${e(s.dogCallName)}</strong> · ${escapeHtml(workWords(s.kind, s.regionLabels))}`, detail: e(s.note) })))
      : htmlNone('No plan steps fall this week.'))
  }
  const taskRows = (tasks: WeeklyTask[]) => htmlRows(tasks.map(t => ({
    when: escapeHtml(dateInWords(t.dueDate, 'short')) + (taskWindow(t) ? `<br>${escapeHtml(taskWindow(t)!)}` : ''),
    what: `<strong>${e(t.dogCallName)}</strong> · ${escapeHtml(workWords(t.kind, t.regionLabels))} · ${escapeHtml(taskWho(t, assistant))}`,
    detail: t.notes ? e(t.notes) : undefined,
  })))
  html.push(mailHeading(assistant ? 'Your tasks this week' : 'Tasks this week'))
  html.push(status.tasks.length ? taskRows(status.tasks) : htmlNone('No tasks are due for the rest of this week.'))
  html.push(mailHeading('Overdue tasks'))
  html.push(status.overdue.length ? taskRows(status.overdue) : htmlNone('Nothing is overdue.'))
  if (!assistant) {
    html.push(mailHeading('Entries closing in the next 14 days'))
    html.push(status.closingSoon.length ? htmlRows(status.closingSoon.map(c => closingWords(status, c))) : htmlNone('No entries close in the next 14 days.'))
    html.push(mailHeading('Class warnings'))
    html.push(status.classWarnings.length
      ? htmlRows(status.classWarnings.map(w => ({ when: escapeHtml(dateInWords(w.showFirstDay, 'short')), what: `<strong>${e(w.dogCallName)}</strong> · ${e(w.classLabel)} at ${e(w.showName)}`, detail: e(w.message) })))
      : htmlNone('No class warnings for the entries in coming shows.'))
    html.push(mailSmallPrint(escapeHtml(classRuleLine(status))))
  }
  if (promptsWork) html.push(htmlCautions())
  html.push(mailButton(status.links.app, 'Open Bloomline'))

  const roleWord = status.recipient.role
  const footer = mailSmallPrint(`You receive this weekly status as ${roleWord === 'assistant' ? 'an' : 'a'} ${roleWord} of ${e(status.organisation.name)}. `
    + `<a href="${escapeHtml(status.links.unsubscribePage)}" style="color:#24463a;">Stop the weekly status</a>`
    + ` (your other Bloomline mail, such as password resets, still comes).`)

  return {
    subject: subjectOf(status),
    html: mailLayout({ title, preheader: summary, bodyHtml: html.join('\n'), footerHtml: footer }),
    text: renderText(status, { greeting, title, intro, summary, toWork, promptsWork }),
    headers: {
      'List-Unsubscribe': `<${status.links.oneClick}>`,
      'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click',
      'Auto-Submitted': 'auto-generated',
    },
  }
}

function classRuleLine(status: WeeklyStatus): string {
  const ruleSet = RULE_SET_INFO[status.organisation.ruleSet]
  return `Classes are checked by age on the first day of each show (rule set: ${ruleSet.label}). ${ruleSet.edition}`
}

function textHeading(text: string): string[] {
  return ['', text.toUpperCase(), '-'.repeat(text.length)]
}

function renderText(status: WeeklyStatus, parts: { greeting: string, title: string, intro: string, summary: string, toWork: RegionsToWork[], promptsWork: boolean }): string {
  const assistant = status.recipient.role === 'assistant'
  const lines: string[] = [parts.title, '', parts.greeting, '', parts.intro, parts.summary]

  if (!assistant) {
    lines.push(...textHeading('Dogs by their next show'))
    lines.push('Readiness out of 100 for the first day of each dog\'s next show.')
    const { groups, noShow } = groupByShow(status.dogs)
    if (!status.dogs.length) lines.push('', status.recipient.role === 'manager' ? 'No active dogs yet.' : 'No active dogs are yours to handle yet.')
    for (const group of groups) {
      const onTrack = group.dogs.filter(d => d.onTrack).length
      lines.push('', `${singleLine(group.show.name)}, ${dateInWords(group.show.firstDay)} (${inDays(group.show.inDays)}): ${onTrack} of ${group.dogs.length} on track`)
      for (const dog of group.dogs) {
        const handler = otherHandler(status, dog)
        lines.push(`- ${singleLine(dog.callName)} (${singleLine(dog.breed)}${handler ? `, ${singleLine(handler)}` : ''}): ${readinessWords(dog)}`)
        if (dog.weakest.length) lines.push(`  Weakest: ${weakestWords(dog)}`)
      }
    }
    if (noShow.length) lines.push('', `Not entered in a show: ${noShow.map(d => singleLine(d.callName)).join(', ')}`)
  }

  lines.push(...textHeading('Regions that need work this week'))
  if (!parts.toWork.length) lines.push(assistant ? 'No coat work is asked of you this week.' : 'No region needs work this week by the plan or the tasks.')
  for (const dog of parts.toWork) lines.push(`- ${singleLine(dog.dogCallName)}: ${dog.work.map(w => workWords(w.kind, w.regionLabels)).join('; ')}`)

  if (!assistant) {
    lines.push(...textHeading('This week\'s plan'))
    if (!status.planSteps.length) lines.push('No plan steps fall this week.')
    for (const s of status.planSteps) {
      lines.push(`- ${dateInWords(s.date, 'short')}: ${singleLine(s.dogCallName)}, ${workWords(s.kind, s.regionLabels)}`)
      if (s.note) lines.push(`  ${singleLine(s.note)}`)
    }
  }

  const taskLines = (tasks: WeeklyTask[]) => tasks.flatMap(t => [
    `- ${taskWhen(t)}: ${singleLine(t.dogCallName)}, ${workWords(t.kind, t.regionLabels)} (${taskWho(t, assistant)})`,
    ...(t.notes ? [`  ${singleLine(t.notes)}`] : []),
  ])
  lines.push(...textHeading(assistant ? 'Your tasks this week' : 'Tasks this week'))
  lines.push(...(status.tasks.length ? taskLines(status.tasks) : ['No tasks are due for the rest of this week.']))
  lines.push(...textHeading('Overdue tasks'))
  lines.push(...(status.overdue.length ? taskLines(status.overdue) : ['Nothing is overdue.']))

  if (!assistant) {
    lines.push(...textHeading('Entries closing in the next 14 days'))
    if (!status.closingSoon.length) lines.push('No entries close in the next 14 days.')
    for (const c of status.closingSoon) {
      lines.push(`- ${singleLine(c.showName)}: entries close ${dateInWords(c.closes.date, 'short')} at ${c.closes.time} (${c.timeZone} time), ${inDays(c.closesInDays)}`)
      lines.push(`  First day ${dateInWords(c.firstDay)}; ${entriesWords(status, c.entryCount)}.`)
    }
    lines.push(...textHeading('Class warnings'))
    if (!status.classWarnings.length) lines.push('No class warnings for the entries in coming shows.')
    for (const w of status.classWarnings) {
      lines.push(`- ${singleLine(w.dogCallName)}, ${singleLine(w.classLabel)} at ${singleLine(w.showName)} (${dateInWords(w.showFirstDay, 'short')}):`)
      lines.push(`  ${singleLine(w.message)}`)
    }
    lines.push('', classRuleLine(status))
  }

  if (parts.promptsWork) {
    lines.push(...textHeading('Before you work a coat'))
    for (const caution of COAT_CAUTIONS) lines.push(`- ${caution}`)
  }

  lines.push('', 'Open Bloomline:', status.links.app)
  lines.push('', '-- ')
  lines.push(`You receive this weekly status as ${status.recipient.role === 'assistant' ? 'an' : 'a'} ${status.recipient.role} of ${singleLine(status.organisation.name)}.`)
  lines.push('To stop it (your other Bloomline mail, such as password resets, still comes):', status.links.unsubscribePage, '')
  return lines.join('\n')
}
