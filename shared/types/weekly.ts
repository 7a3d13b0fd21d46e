import type { OutboxStatus } from './mail'
import type { Role } from './organisation'

/** An organisation's weekly-status settings, with where the current week stands. */
export interface WeeklySettingsView {
  /** ISO weekday, 1 = Monday … 7 = Sunday, on the organisation's clock. */
  day: number
  /** Hour 0–23 on the organisation's clock. */
  hour: number
  enabled: boolean
  toAssistants: boolean
  timeZone: string
  /** The current ISO week on the organisation's calendar, e.g. `2026-W49`. */
  week: string
  /** This week's send time (UTC instant), and whether it has passed. */
  sendAt: string
  due: boolean
  /** The next send time after now (UTC instant); null while the weekly status is off. */
  nextSendAt: string | null
}

/**
 * Whether a member gets the week's status and where theirs stands: `sent`, `pending`, `sending`,
 * `failed` or `cancelled` (the outbox row; cancelled when they unsubscribed before it went), `unsubscribed`, `not-a-recipient` (an assistant while the
 * organisation sends to managers and handlers only), or `not-yet` (not queued for that week yet).
 */
export type WeeklyRecipientState = OutboxStatus | 'unsubscribed' | 'not-a-recipient' | 'not-yet'

/** One member of the organisation as the weekly page lists them. */
export interface WeeklyRecipientView {
  userId: number
  name: string
  email: string
  role: Role
  /** Would get the week's status: a recipient by role and not unsubscribed. */
  receives: boolean
  unsubscribed: boolean
  /** When they unsubscribed (UTC instant), or null. */
  unsubscribedAt: string | null
  state: WeeklyRecipientState
  /** The week's message in the outbox, when there is one (queued even before an unsubscribe). */
  delivery: {
    id: number
    status: OutboxStatus
    subject: string
    queuedAt: string
    sentAt: string | null
    attempts: number
    lastError: string | null
  } | null
}

/** Who gets an ISO week's status in the organisation. */
export interface WeeklyRecipientsView {
  week: string
  weekStart: string
  weekEnd: string
  /** That week's send time (UTC instant) and whether it has passed. */
  sendAt: string
  due: boolean
  enabled: boolean
  recipients: WeeklyRecipientView[]
}

/** Exactly what a member gets this week: the message in the outbox once queued, else as it would be rendered now. */
export interface WeeklyPreviewView {
  week: string
  member: { userId: number, name: string, email: string, role: Role }
  receives: boolean
  state: WeeklyRecipientState
  /** `outbox`: the message already queued or sent this week; `now`: rendered from the kennel as it stands. */
  source: 'outbox' | 'now'
  subject: string
  html: string
  text: string
  headers: Record<string, string>
}

/** What "send now" did for one member. */
export interface WeeklySendOutcome {
  userId: number
  name: string
  email: string
  /** `queued`: a new message; `already-sent`: this week's is already in the outbox (its status given); `unsubscribed`; `not-a-recipient`. */
  outcome: 'queued' | 'already-sent' | 'unsubscribed' | 'not-a-recipient'
  status: OutboxStatus | null
}

/** The answer of POST /api/weekly/send-now. */
export interface WeeklySendResult {
  week: string
  results: WeeklySendOutcome[]
  queued: number
}

/** What an unsubscribe link stands for, as its one-button page shows it. */
export interface UnsubscribeLookupView {
  name: string
  email: string
  organisationName: string
  kind: 'weekly_status'
  unsubscribed: boolean
  unsubscribedAt: string | null
}

/** The caller's own weekly-status subscription in the active organisation. */
export interface WeeklySubscriptionView {
  subscribed: boolean
  unsubscribedAt: string | null
  /** Whether the organisation sends the weekly status to the caller's role at all (it is on, and assistants get it when it says so). */
  sentToRole: boolean
  /** When it goes out, on the organisation's clock: ISO weekday (1 = Monday) and hour. */
  day: number
  hour: number
  timeZone: string
  /** The next sending (UTC instant); null while the weekly status is off. */
  nextSendAt: string | null
}
