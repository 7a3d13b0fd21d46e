import { DataTypes, literal, type QueryInterface } from 'sequelize'

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
}
const organisation = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' }

/** The import history and each organisation's remembered column mapping. */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('imports', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    file_name: { type: DataTypes.STRING(255), allowNull: false },
    counts: { type: DataTypes.JSONB, allowNull: false },
    mapping: { type: DataTypes.JSONB, allowNull: false },
    // The file's headers and the rows left out, with their reasons, for the downloadable report.
    left_out: { type: DataTypes.JSONB, allowNull: false },
    ...timestamps,
  })
  await qi.addIndex('imports', ['organisation_id', 'created_at'])

  await qi.createTable('import_mappings', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: { ...organisation, unique: true },
    mapping: { type: DataTypes.JSONB, allowNull: false },
    ...timestamps,
  })
}

/** Drops what `up` made. */
export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('import_mappings')
  await qi.dropTable('imports')
}
