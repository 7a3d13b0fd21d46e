import { DataTypes, literal, type QueryInterface } from 'sequelize'

// A database default as well as Sequelize's own, so raw inserts (bulk loads, scripts) get timestamps too.
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
}

/** Organisations, users, memberships and the sign-in failure counter. */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('organisations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.STRING(10), allowNull: false },
    time_zone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
    rule_set: { type: DataTypes.STRING(3), allowNull: false },
    ...timestamps,
  })
  await qi.sequelize.query(`ALTER TABLE organisations
    ADD CONSTRAINT organisations_kind_check CHECK (kind IN ('kennel', 'club')),
    ADD CONSTRAINT organisations_rule_set_check CHECK (rule_set IN ('AKC', 'KC', 'FCI'))`)

  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    session_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_organisation_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organisations', key: 'id' }, onDelete: 'SET NULL' },
    ...timestamps,
  })
  // E-mail addresses are compared without regard to case everywhere.
  await qi.sequelize.query('CREATE UNIQUE INDEX users_email_lower ON users (lower(email))')

  await qi.createTable('memberships', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    role: { type: DataTypes.STRING(10), allowNull: false },
    ...timestamps,
  })
  await qi.addConstraint('memberships', { type: 'unique', fields: ['user_id', 'organisation_id'], name: 'memberships_user_organisation' })
  await qi.sequelize.query(`ALTER TABLE memberships ADD CONSTRAINT memberships_role_check CHECK (role IN ('manager', 'handler', 'assistant'))`)
  await qi.addIndex('memberships', ['organisation_id'])

  await qi.createTable('sign_in_failures', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    ...timestamps,
  })
  await qi.addIndex('sign_in_failures', ['email', 'created_at'])

  await qi.createTable('sign_in_locks', {
    email: { type: DataTypes.STRING(254), primaryKey: true },
    locked_until: { type: DataTypes.DATE, allowNull: false },
    ...timestamps,
  })
}

/** Drops what `up` made, newest first. */
export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('sign_in_locks')
  await qi.dropTable('sign_in_failures')
  await qi.dropTable('memberships')
  await qi.dropTable('users')
  await qi.dropTable('organisations')
}
