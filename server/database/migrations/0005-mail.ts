import { DataTypes, literal, type QueryInterface } from 'sequelize'

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
}

/** Mail: the outbox, invitations, password resets, weekly-status settings, unsubscribes and the demo mailbox. */
export async function up({ context: qi }: { context: QueryInterface }) {
  // ISO weekday (1 = Monday) and hour in the organisation's own time zone.
  await qi.addColumn('organisations', 'weekly_day', { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 1 })
  await qi.addColumn('organisations', 'weekly_hour', { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 7 })
  await qi.addColumn('organisations', 'weekly_enabled', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true })
  await qi.addColumn('organisations', 'weekly_to_assistants', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false })
  await qi.sequelize.query(`ALTER TABLE organisations
    ADD CONSTRAINT organisations_weekly_day_check CHECK (weekly_day BETWEEN 1 AND 7),
    ADD CONSTRAINT organisations_weekly_hour_check CHECK (weekly_hour BETWEEN 0 AND 23)`)

  await qi.createTable('mail_outbox', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    recipient_user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    recipient_email: { type: DataTypes.STRING(254), allowNull: false },
    recipient_name: { type: DataTypes.STRING(120), allowNull: true },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    // What makes the message one of a kind: the ISO week for a weekly status, the invitation or reset for the others.
    period_key: { type: DataTypes.STRING(60), allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    html: { type: DataTypes.TEXT, allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'pending' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.TEXT, allowNull: true },
    locked_until: { type: DataTypes.DATE, allowNull: true },
    // Who holds the row while it is being sent: only that worker may record how the send ended.
    claim_token: { type: DataTypes.UUID, allowNull: true },
    next_attempt_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    message_id: { type: DataTypes.STRING(200), allowNull: false },
    ...timestamps,
  })
  await qi.sequelize.query(`ALTER TABLE mail_outbox
    ADD CONSTRAINT mail_outbox_status_check CHECK (status IN ('pending', 'sending', 'sent', 'failed', 'cancelled')),
    ADD CONSTRAINT mail_outbox_kind_check CHECK (kind IN ('invitation', 'password_reset', 'weekly_status'))`)
  // The key that makes a retry, a restart or a second instance harmless: one message per
  // organisation, recipient, kind and period, however often it is queued.
  await qi.sequelize.query(`CREATE UNIQUE INDEX mail_outbox_key ON mail_outbox
    (COALESCE(organisation_id, 0), lower(recipient_email), kind, period_key)`)
  await qi.addIndex('mail_outbox', ['organisation_id', 'created_at'])
  await qi.sequelize.query(`CREATE INDEX mail_outbox_waiting ON mail_outbox (next_attempt_at) WHERE status IN ('pending', 'sending')`)

  await qi.createTable('invitations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: true },
    role: { type: DataTypes.STRING(10), allowNull: false },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    invited_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    sent_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  })
  await qi.sequelize.query(`ALTER TABLE invitations ADD CONSTRAINT invitations_role_check CHECK (role IN ('manager', 'handler', 'assistant'))`)
  // One open invitation per address and organisation; accepted and revoked ones stay for the record.
  await qi.sequelize.query(`CREATE UNIQUE INDEX invitations_open ON invitations (organisation_id, lower(email))
    WHERE accepted_at IS NULL AND revoked_at IS NULL`)

  await qi.createTable('password_resets', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  })
  await qi.addIndex('password_resets', ['user_id'])

  await qi.createTable('mail_unsubscribes', {
    user_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    organisation_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(20), primaryKey: true },
    ...timestamps,
  })

  // What the demo's own SMTP server received (demo mode only; real mail never lands here).
  await qi.createTable('demo_mailbox', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    envelope_from: { type: DataTypes.STRING(254), allowNull: true },
    envelope_to: { type: DataTypes.TEXT, allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: true },
    raw: { type: DataTypes.TEXT, allowNull: false },
    ...timestamps,
  })
}

/** Drops what `up` made, newest first. */
export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('demo_mailbox')
  await qi.dropTable('mail_unsubscribes')
  await qi.dropTable('password_resets')
  await qi.dropTable('invitations')
  await qi.dropTable('mail_outbox')
  await qi.sequelize.query(`ALTER TABLE organisations
    DROP CONSTRAINT organisations_weekly_day_check, DROP CONSTRAINT organisations_weekly_hour_check`)
  for (const column of ['weekly_to_assistants', 'weekly_enabled', 'weekly_hour', 'weekly_day']) await qi.removeColumn('organisations', column)
}
