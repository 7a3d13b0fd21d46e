import { expect } from 'vitest'
import type { InvitationCreateResult } from '../../../shared/types/invitations'
import type { MemberView, Role } from '../../../shared/types/organisation'
import { baseUrl, CookieJar, postCredentials, request } from './http'
import { linkIn, type ReceivedMail, type startSmtp } from './smtp'

export type Smtp = Awaited<ReturnType<typeof startSmtp>>

/** The header fields of a message as they arrived, unfolded (RFC 5322 §2.2.3), name lower-cased. */
export function headerFields(mail: ReceivedMail): { name: string, value: string }[] {
  const block = mail.raw.split(/\r?\n\r?\n/)[0]!
  return block.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/).map((line) => {
    const colon = line.indexOf(':')
    return { name: line.slice(0, colon).trim().toLowerCase(), value: line.slice(colon + 1).trim() }
  })
}

/**
 * Checks a message against RFC 5322 §3.6 (the table of header fields: exactly one Date and one
 * From; Message-ID at most once, and §3.6.4 says every message SHOULD have one, so Bloomline always
 * sends it) and RFC 2046 §5.1.4 (multipart/alternative carrying both a text/plain and a text/html part).
 */
export function expectWellFormedMail(mail: ReceivedMail) {
  const count = (name: string) => headerFields(mail).filter(f => f.name === name).length
  expect(count('date'), 'Date fields').toBe(1)
  expect(count('from'), 'From fields').toBe(1)
  expect(count('message-id'), 'Message-ID fields').toBe(1)
  expect(mail.parsed.messageId).toMatch(/^<[^<>@\s]+@[^<>@\s]+>$/)
  expect(mail.parsed.from?.value[0]?.address).toBe('bloomline@larkspur.example')
  expect(mail.parsed.date?.getTime()).not.toBeNaN()
  expect(mail.raw).toMatch(/content-type:\s*multipart\/alternative/i)
  expect(mail.raw).toMatch(/content-type:\s*text\/plain/i)
  expect(mail.raw).toMatch(/content-type:\s*text\/html/i)
  expect(mail.parsed.text?.trim().length).toBeGreaterThan(50)
  expect(typeof mail.parsed.html === 'string' && mail.parsed.html.length > 50).toBe(true)
}

/**
 * Whom a message was for: its envelope, or else its To field. (smtp.ts reads the envelope after
 * accepting the message, when smtp-server has already reset it for the next one, so it can be empty.)
 */
export function recipientsOf(mail: ReceivedMail): string[] {
  if (mail.envelopeTo.length) return mail.envelopeTo.map(a => a.toLowerCase())
  const to = Array.isArray(mail.parsed.to) ? mail.parsed.to : mail.parsed.to ? [mail.parsed.to] : []
  return to.flatMap(t => t.value.map(v => (v.address ?? '').toLowerCase()))
}

/** The messages to an address whose subject contains `subject`, oldest first. */
export function mailsTo(smtp: Smtp, address: string, subject: string) {
  return smtp.received.filter(m => recipientsOf(m).includes(address.toLowerCase()) && m.parsed.subject?.includes(subject))
}

/** Waits until `count` messages with `subject` have reached `address`, and returns the newest. */
export async function waitForMail(smtp: Smtp, address: string, subject: string, count = 1) {
  await smtp.waitFor(() => mailsTo(smtp, address, subject).length >= count, 30_000)
  return mailsTo(smtp, address, subject).at(-1)!
}

/** The link's secret, the last part of an invitation or reset link. */
export function tokenOf(link: string): string {
  return new URL(link).pathname.split('/').at(-1)!
}

/** The invitation link in a received invitation. */
export function invitationLink(mail: ReceivedMail): string {
  return linkIn(mail, `${baseUrl}/invite/`)
}

/** Invites an address as a manager, waits for the message, and returns the invitation and its link. */
export async function invite(smtp: Smtp, manager: CookieJar, body: { email: string, role: Role, name?: string }) {
  const before = mailsTo(smtp, body.email, 'invites you').length
  const res = await request(manager, '/api/invitations', { method: 'POST', json: body })
  expect([200, 201]).toContain(res.status)
  const result = await res.json() as InvitationCreateResult
  const mail = await waitForMail(smtp, body.email, 'invites you', before + 1)
  return { result, mail, link: invitationLink(mail), token: tokenOf(invitationLink(mail)) }
}

/** Signs in with an e-mail and password through next-auth's real endpoints; the jar, or null when refused. */
export async function signInAs(email: string, password: string): Promise<CookieJar | null> {
  const jar = new CookieJar()
  const res = await postCredentials(jar, { email, password })
  if (res.status !== 200) return null
  const { url } = await res.json() as { url: string }
  return new URL(url).searchParams.get('error') ? null : jar
}

/** Invites a new person, joins through the link with a name and password, and signs them in. */
export async function inviteAndJoin(smtp: Smtp, manager: CookieJar, person: { email: string, name: string, role: Role, password: string }) {
  const { token } = await invite(smtp, manager, { email: person.email, role: person.role, name: person.name })
  const accepted = await request(null, `/api/public/invitations/${token}/accept`, { method: 'POST', json: { name: person.name, password: person.password } })
  expect(accepted.status).toBe(200)
  const jar = await signInAs(person.email, person.password)
  expect(jar).not.toBeNull()
  return jar!
}

/** The membership of an address in the manager's organisation, or undefined. */
export async function memberByEmail(manager: CookieJar, email: string): Promise<MemberView | undefined> {
  const members = await (await request(manager, '/api/members')).json() as MemberView[]
  return members.find(m => m.email.toLowerCase() === email.toLowerCase())
}

/** Removes an address from the manager's organisation when it is a member, so later test files find the demo team as seeded. */
export async function removeIfMember(manager: CookieJar, email: string) {
  const member = await memberByEmail(manager, email)
  if (member) expect((await request(manager, `/api/members/${member.id}`, { method: 'DELETE' })).status).toBe(204)
}
