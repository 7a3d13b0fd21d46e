import { DataTypes, literal, type QueryInterface } from 'sequelize'

/** Each person's private calendar feed: only the sha-256 of its secret token is stored. */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('calendar_feeds', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    organisation_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  })
  // One live feed per person and organisation; revoked ones stay for the record.
  await qi.addIndex('calendar_feeds', ['user_id', 'organisation_id'], { unique: true, where: { revoked_at: null }, name: 'calendar_feeds_live' })
}

/** Drops what `up` made. */
export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('calendar_feeds')
}
