import { describe, expect, it } from 'vitest'
import { passwordResetMail, type PasswordResetMailInput } from '../../../../shared/mail/passwordReset'

// Invented people and kennels; `.example` is reserved (RFC 2606 §3).
const input: PasswordResetMailInput = {
  name: 'Wren Halloway',
  email: 'wren@fernbrake.example',
  organisationNames: ['Fernbrake Wire Kennel', 'Ashgill Terrier Club'],
  link: 'https://bloomline.example/password/reset/abcDEF123_-abcDEF123_-abcDEF123_-abcDEF1',
  expiresAt: new Date('2026-12-08T10:30:00Z'),
  validMinutes: 60,
  timeZone: 'Europe/London',
}

function visibleText(html: string): string {
  return html.replace(/<div style="display:none[^]*?<\/div>/, '').replace(/<\/?(?:strong|a)\b[^>]*>/g, '').replace(/<[^>]+>/g, ' ')
    .replace(/&amp;/g, '&').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, '\'')
    .replace(/\s+/g, ' ')
}

describe('passwordResetMail', () => {
  const mail = passwordResetMail(input)

  it('has a plain subject', () => {
    expect(mail.subject).toBe('Reset your Bloomline password')
  })

  it.each(['text', 'html'] as const)('the %s part names the account, its organisations, the expiry in words and what to do if unexpected', (part) => {
    const body = part === 'html' ? visibleText(mail.html) : mail.text
    expect(body).toContain('Hello Wren Halloway,')
    expect(body).toContain('your Bloomline account wren@fernbrake.example, which you use for Fernbrake Wire Kennel and Ashgill Terrier Club.')
    // 8 December 2026 is a Tuesday; London is on GMT in December (from memory).
    expect(body).toContain('The link works once, for one hour: until Tuesday 8 December 2026 at 10:30 (Europe/London time).')
    expect(body).toContain('signs you out of Bloomline everywhere')
    expect(body).toContain('If you did not ask for this, ignore this message: your password stays as it is.')
    expect(body).toContain('Bloomline keeps coat work, readiness and show plans')
  })

  it('gives the link as a button and as a plain address, and alone on a line of the text part', () => {
    const hrefs = [...mail.html.matchAll(/href="([^"]+)"/g)].map(m => m[1])
    expect(hrefs.filter(h => h === input.link)).toHaveLength(2)
    expect(mail.html).toContain('>Choose a new password</a>')
    expect(mail.text.split('\n')).toContain(input.link)
  })

  it('is a whole HTML document with no remote images or scripts', () => {
    expect(mail.html).toMatch(/^<!DOCTYPE html>/)
    expect(mail.html).not.toMatch(/<img|<script|<link|url\(/i)
  })

  it.each([
    [[], 'your Bloomline account wren@fernbrake.example.'],
    [['Fernbrake Wire Kennel'], 'which you use for Fernbrake Wire Kennel.'],
    [['A', 'B', 'C'], 'which you use for A, B and C.'],
  ])('lists %j as a sentence', (names, words) => {
    expect(passwordResetMail({ ...input, organisationNames: names }).text).toContain(words)
  })

  it('escapes the name in the HTML part', () => {
    const hostile = passwordResetMail({ ...input, name: '<i>Wren</i>' })
    expect(hostile.html).toContain('Hello &lt;i&gt;Wren&lt;/i&gt;,')
    expect(hostile.html).not.toContain('<i>Wren</i>')
  })
})
