import { describe, expect, it } from 'vitest'
import { BLOOMLINE_IN_ONE_LINE, instantInWords, invitationMail, type InvitationMailInput } from '../../../../shared/mail/invitation'

// Invented kennel and people (DESIGN.md: demo data is invented); `.example` is reserved (RFC 2606 §3).
const input: InvitationMailInput = {
  organisationName: 'Fernbrake Wire Kennel',
  inviterName: 'Odile Marsh',
  inviteeName: 'Wren Halloway',
  role: 'handler',
  link: 'https://bloomline.example/invite/abcDEF123_-abcDEF123_-abcDEF123_-abcDEF1',
  expiresAt: new Date('2026-12-08T09:30:00Z'),
  validDays: 7,
  timeZone: 'Europe/London',
  sentCount: 1,
}

/** The text a reader sees in the HTML part, tags dropped and entities read back. */
function visibleText(html: string): string {
  return html.replace(/<div style="display:none[^]*?<\/div>/, '').replace(/<\/?(?:strong|a)\b[^>]*>/g, '').replace(/<[^>]+>/g, ' ')
    .replace(/&amp;/g, '&').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, '\'')
    .replace(/\s+/g, ' ')
}

describe('instantInWords', () => {
  // 8 December 2026 is a Tuesday, and London keeps GMT (UTC+0) in winter and BST (UTC+1) from the
  // last Sunday of March to the last Sunday of October (UK Summer Time Order; from memory).
  it.each([
    [new Date('2026-12-08T09:30:00Z'), 'Europe/London', 'Tuesday 8 December 2026 at 09:30 (Europe/London time)'],
    [new Date('2027-07-01T12:00:00Z'), 'Europe/London', 'Thursday 1 July 2027 at 13:00 (Europe/London time)'],
    [new Date('2027-07-01T12:00:00Z'), 'UTC', 'Thursday 1 July 2027 at 12:00 (UTC)'],
    // Just after midnight in Dublin in summer is the evening before in UTC (IST is UTC+1).
    [new Date('2027-06-30T23:15:00Z'), 'Europe/Dublin', 'Thursday 1 July 2027 at 00:15 (Europe/Dublin time)'],
  ])('%s in %s reads "%s"', (at, zone, words) => {
    expect(instantInWords(at, zone)).toBe(words)
  })
})

describe('invitationMail', () => {
  const mail = invitationMail(input)

  it('names the organisation and the inviter in the subject', () => {
    expect(mail.subject).toBe('Odile Marsh invites you to Fernbrake Wire Kennel on Bloomline')
  })

  it.each(['text', 'html'] as const)('the %s part says who invites whom, to what, as which role, and what Bloomline is', (part) => {
    const body = part === 'html' ? visibleText(mail.html) : mail.text
    expect(body).toContain('Hello Wren Halloway,')
    expect(body).toContain('Odile Marsh invites you to join Fernbrake Wire Kennel on Bloomline as a handler.')
    expect(body).toContain('you will see the dogs you take into the ring')
    expect(body).toContain(BLOOMLINE_IN_ONE_LINE)
    expect(body).toContain('The link works once, for 7 days: until Tuesday 8 December 2026 at 09:30 (Europe/London time).')
    expect(body).toContain('If you did not expect this invitation, ignore this message')
  })

  it('gives the link as a button and as a plain address in the HTML part', () => {
    const hrefs = [...mail.html.matchAll(/href="([^"]+)"/g)].map(m => m[1])
    expect(hrefs.filter(h => h === input.link)).toHaveLength(2)
    expect(mail.html).toContain(`>Accept the invitation</a>`)
    expect(mail.html).toContain(`>${input.link}</a>`)
  })

  it('puts the full link on a line of its own in the text part', () => {
    expect(mail.text.split('\n')).toContain(input.link)
  })

  it('is a whole HTML document with no remote images, scripts or style sheets', () => {
    expect(mail.html).toMatch(/^<!DOCTYPE html>/)
    expect(mail.html).not.toMatch(/<img|<script|<link|url\(/i)
  })

  it.each([
    ['manager', 'as a manager', 'you will see and run everything'],
    ['assistant', 'as an assistant', 'your own coat-work tasks'],
  ] as const)('words the %s role for the reader', (role, as, does) => {
    const text = invitationMail({ ...input, role }).text
    expect(text).toContain(as)
    expect(text).toContain(does)
  })

  it('says a resent link replaces the earlier one, and a first one does not', () => {
    expect(invitationMail({ ...input, sentCount: 2 }).text).toContain('any earlier invitation link to you no longer works')
    expect(mail.text).not.toContain('earlier invitation link')
  })

  it('without names, greets plainly and names a manager of the organisation', () => {
    const plain = invitationMail({ ...input, inviterName: null, inviteeName: null })
    expect(plain.text.startsWith('Hello,\n')).toBe(true)
    expect(plain.subject).toBe('A manager of Fernbrake Wire Kennel invites you to Fernbrake Wire Kennel on Bloomline')
  })

  it('escapes names in the HTML and keeps line breaks out of the subject', () => {
    const hostile = invitationMail({ ...input, inviterName: 'Odile <b>Marsh</b>\r\nBcc: someone@else.example', organisationName: 'Fern & "Brake"' })
    expect(hostile.html).not.toContain('<b>Marsh</b>')
    expect(hostile.html).toContain('Odile &lt;b&gt;Marsh&lt;/b&gt;')
    expect(hostile.html).toContain('Fern &amp; &quot;Brake&quot;')
    expect(hostile.subject).not.toMatch(/[\r\n]/)
  })
})
