import type { OutboxStatus } from './mail'
import type { Role } from './organisation'

/** An open invitation as managers and handlers see it on the Team page; never its token. */
export interface InvitationView {
  id: number
  email: string
  name: string | null
  role: Role
  invitedBy: { id: number, name: string } | null
  /** When the current link was sent (the first sending, or the latest resend). */
  sentAt: string
  sentCount: number
  expiresAt: string
  expired: boolean
  /** Where the current link's message stands in the outbox, when it is there. */
  delivery: OutboxStatus | null
}

/** What creating an invitation did: a new one (201), or the open one for that address sent again. */
export interface InvitationCreateResult {
  invitation: InvitationView
  resent: boolean
}

/** Where an invitation link stands. */
export type InvitationLinkStatus = 'open' | 'expired' | 'revoked' | 'accepted'

/** What the accept page learns from a link. The address and whether it has an account only while the link is open. */
export interface InvitationLookupView {
  status: InvitationLinkStatus
  organisationName: string
  /** The organisation's IANA time zone, to show the expiry on its clock. */
  timeZone: string
  inviterName: string | null
  role: Role
  expiresAt: string
  email: string | null
  name: string | null
  hasAccount: boolean | null
  /** One sentence for a link that no longer works, naming whom to ask. */
  message: string | null
}

/** What joining did: the account's address (to sign in with) and the organisation joined. */
export interface InvitationAcceptResult {
  email: string
  organisationName: string
  role: Role
  newAccount: boolean
}

/** Where a password-reset link stands. */
export type PasswordResetLinkStatus = 'open' | 'expired' | 'used'

/** What the reset page learns from a link; the address only while it works. */
export interface PasswordResetLookupView {
  status: PasswordResetLinkStatus
  email: string | null
  expiresAt: string
  /** The person's home organisation's time zone (UTC without one), to show the expiry on their clock. */
  timeZone: string
  message: string | null
}

/** The one answer to a reset request, whoever asked. */
export interface PasswordResetRequestResult {
  message: string
}
