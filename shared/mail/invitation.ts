import type { Role } from '../types/organisation'
import { escapeHtml, mailButton, mailLayout, mailParagraph, mailSmallPrint } from './layout'

/** What Bloomline is, in one line, for people who have never heard of it. */
export const BLOOMLINE_IN_ONE_LINE = 'Bloomline keeps coat work, readiness and show plans for kennels and clubs that campaign hand-stripped show dogs.'

/** What each role may do, in words an invitee can weigh (DESIGN.md §2). */
export const ROLE_IN_WORDS: Record<Role, { article: string, noun: string, does: string }> = {
  manager: { article: 'a', noun: 'manager', does: 'you will see and run everything in the organisation: dogs, coat profiles, shows and entries, the team and the weekly e-mail' },
  handler: { article: 'a', noun: 'handler', does: 'you will see the dogs you take into the ring, with their shows and entries, and log coat work and set tasks for them' },
  assistant: { article: 'an', noun: 'assistant', does: 'you will see your own coat-work tasks and the coat of the dogs on them, log the work you do and run the area timer' },
}

/** A name or title on one line: a line break in it must not reach a header or break the text part. */
export function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ').trim()
}

/** An instant in words on the organisation's clock, e.g. "Tuesday 8 December 2026 at 09:30 (Europe/London time)". */
export function instantInWords(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(at)
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find(p => p.type === type)?.value ?? ''
  const zone = timeZone === 'UTC' || timeZone === 'Etc/UTC' ? 'UTC' : `${timeZone} time`
  return `${part('weekday')} ${part('day')} ${part('month')} ${part('year')} at ${part('hour')}:${part('minute')} (${zone})`
}

/** What an invitation message says. */
export interface InvitationMailInput {
  organisationName: string
  inviterName: string | null
  inviteeName: string | null
  role: Role
  link: string
  expiresAt: Date
  validDays: number
  timeZone: string
  /** 1 for the first sending; more when a manager sent it again, which makes earlier links stop working. */
  sentCount: number
}

/** The invitation to join an organisation: subject, HTML and plain text, with the link as a button and as a plain address. */
export function invitationMail(input: InvitationMailInput) {
  const organisation = oneLine(input.organisationName)
  const inviter = input.inviterName ? oneLine(input.inviterName) : null
  const role = ROLE_IN_WORDS[input.role]
  const who = inviter ?? `A manager of ${organisation}`
  const greeting = input.inviteeName ? `Hello ${oneLine(input.inviteeName)},` : 'Hello,'
  const until = instantInWords(input.expiresAt, input.timeZone)
  const days = `${input.validDays} day${input.validDays === 1 ? '' : 's'}`
  const subject = `${who} invites you to ${organisation} on Bloomline`
  const invites = `${who} invites you to join ${organisation} on Bloomline as ${role.article} ${role.noun}.`
  const asRole = `As ${role.article} ${role.noun} ${role.does}.`
  const expiry = `The link works once, for ${days}: until ${until}.`
  const replaced = input.sentCount > 1 ? 'This is a new link: any earlier invitation link to you no longer works.' : null
  const account = 'If you already have a Bloomline account with this address, you join with your current password.'
  const ignore = 'If you did not expect this invitation, ignore this message: nothing happens unless the link is used.'

  const html = mailLayout({
    title: `Join ${organisation} on Bloomline`,
    preheader: invites,
    bodyHtml: [
      mailParagraph(escapeHtml(greeting)),
      mailParagraph(`${escapeHtml(who)} invites you to join <strong>${escapeHtml(organisation)}</strong> on Bloomline as ${role.article} <strong>${role.noun}</strong>.`),
      mailParagraph(escapeHtml(asRole)),
      mailParagraph(escapeHtml(BLOOMLINE_IN_ONE_LINE)),
      mailButton(input.link, 'Accept the invitation'),
      mailSmallPrint(`Or paste this address into your browser:<br><a href="${escapeHtml(input.link)}" style="color:#24463a;word-break:break-all;">${escapeHtml(input.link)}</a>`),
      mailSmallPrint(escapeHtml(expiry) + (replaced ? ` ${escapeHtml(replaced)}` : '')),
      mailSmallPrint(escapeHtml(account)),
    ].join('\n'),
    footerHtml: mailSmallPrint(escapeHtml(ignore)),
  })

  const text = [
    greeting,
    '',
    invites,
    '',
    asRole,
    '',
    BLOOMLINE_IN_ONE_LINE,
    '',
    'Accept the invitation:',
    input.link,
    '',
    expiry,
    ...(replaced ? [replaced] : []),
    account,
    '',
    ignore,
    '',
    '-- ',
    'Sent by Bloomline for ' + organisation + '.',
    '',
  ].join('\n')

  return { subject, html, text }
}
