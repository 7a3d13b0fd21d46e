import { describe, expect, it } from 'vitest'
import { appUrl, mailFrom, retryDelaySeconds, smtpSettings } from '../../../../server/utils/mail'

describe('smtpSettings', () => {
  it.each([
    // nodemailer's SMTP transport: port 465 is TLS from the first byte ("secure"); 587 upgrades with STARTTLS (RFC 8314 §3.3, RFC 3207).
    [{ SMTP_HOST: 'mail.example', SMTP_TLS: 'implicit' }, { host: 'mail.example', port: 465, tls: 'implicit' }],
    [{ SMTP_HOST: 'mail.example' }, { host: 'mail.example', port: 587, tls: 'opportunistic' }],
    [{ SMTP_HOST: 'mail.example', SMTP_PORT: '2525', SMTP_USER: 'kennel', SMTP_PASSWORD: 'secret', SMTP_TLS: 'required' }, { host: 'mail.example', port: 2525, user: 'kennel', password: 'secret', tls: 'required' }],
  ])('reads %j', (env, expected) => {
    expect(smtpSettings(env)).toMatchObject(expected)
  })

  it('is null with no host and no demo server, and refuses a TLS mode it does not know', () => {
    expect(smtpSettings({})).toBeNull()
    expect(() => smtpSettings({ SMTP_HOST: 'mail.example', SMTP_TLS: 'yes' })).toThrow(/SMTP_TLS must be/)
  })
})

describe('mailFrom and appUrl', () => {
  it('default to something that works on one machine', () => {
    expect(mailFrom({})).toBe('Bloomline <bloomline@localhost>')
    expect(appUrl('/invite/abc', { AUTH_ORIGIN: 'http://localhost:3000/api/auth' })).toBe('http://localhost:3000/invite/abc')
  })

  it('use the public address when one is set', () => {
    expect(appUrl('/password/reset/x', { BLOOMLINE_PUBLIC_URL: 'https://kennel.example', AUTH_ORIGIN: 'http://localhost:3000/api/auth' }))
      .toBe('https://kennel.example/password/reset/x')
  })
})

describe('retryDelaySeconds', () => {
  // Common practice, no source: exponential back-off that doubles each try, capped at an hour.
  it.each([[1, 30], [2, 60], [3, 120], [6, 960], [8, 3600], [20, 3600]])('after %i failed tries waits %i s', (attempts, seconds) => {
    expect(retryDelaySeconds(attempts, 30)).toBe(seconds)
  })
})
