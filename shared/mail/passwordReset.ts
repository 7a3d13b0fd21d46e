import { BLOOMLINE_IN_ONE_LINE, instantInWords, oneLine } from './invitation'
import { escapeHtml, mailButton, mailLayout, mailParagraph, mailSmallPrint } from './layout'

/** What a password-reset message says. */
export interface PasswordResetMailInput {
  name: string
  email: string
  /** The organisations the account works in, so the person knows which account this is. */
  organisationNames: string[]
  link: string
  expiresAt: Date
  validMinutes: number
  timeZone: string
}

function list(names: string[]): string {
  if (names.length <= 1) return names.join('')
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`
}

/** The password-reset message: subject, HTML and plain text, with the link as a button and as a plain address. */
export function passwordResetMail(input: PasswordResetMailInput) {
  const greeting = `Hello ${oneLine(input.name)},`
  const organisations = input.organisationNames.map(oneLine)
  const usedFor = organisations.length ? `, which you use for ${list(organisations)}` : ''
  const asked = `Someone, we hope you, asked to reset the password of your Bloomline account ${input.email}${usedFor}.`
  const duration = input.validMinutes === 60 ? 'one hour' : `${input.validMinutes} minutes`
  const expiry = `The link works once, for ${duration}: until ${instantInWords(input.expiresAt, input.timeZone)}. Only the newest reset link works.`
  const signOut = 'Setting a new password signs you out of Bloomline everywhere, so sign in again with it on each device.'
  const ignore = 'If you did not ask for this, ignore this message: your password stays as it is.'

  const html = mailLayout({
    title: 'Reset your Bloomline password',
    preheader: `A link to choose a new password; it works for ${duration}.`,
    bodyHtml: [
      mailParagraph(escapeHtml(greeting)),
      mailParagraph(escapeHtml(asked)),
      mailButton(input.link, 'Choose a new password'),
      mailSmallPrint(`Or paste this address into your browser:<br><a href="${escapeHtml(input.link)}" style="color:#24463a;word-break:break-all;">${escapeHtml(input.link)}</a>`),
      mailSmallPrint(escapeHtml(expiry)),
      mailSmallPrint(escapeHtml(signOut)),
      mailParagraph(escapeHtml(BLOOMLINE_IN_ONE_LINE)),
    ].join('\n'),
    footerHtml: mailSmallPrint(escapeHtml(ignore)),
  })

  const text = [
    greeting,
    '',
    asked,
    '',
    'Choose a new password:',
    input.link,
    '',
    expiry,
    signOut,
    '',
    ignore,
    '',
    '-- ',
    BLOOMLINE_IN_ONE_LINE,
    '',
  ].join('\n')

  return { subject: 'Reset your Bloomline password', html, text }
}
