import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Organisation } from './organisation'
import type { User } from './user'

/** One committed import: who, when, which file, what it did, the mapping and the rows left out. */
export class ImportRecord extends Model<InferAttributes<ImportRecord>, InferCreationAttributes<ImportRecord>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare userId: ForeignKey<User['id']> | null
  declare fileName: string
  declare counts: object
  declare mapping: object
  declare leftOut: { headers: string[], rows: { row: number, cells: Record<string, string>, reasons: string[] }[] }
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    ImportRecord.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      fileName: { type: DataTypes.STRING(255), allowNull: false },
      counts: { type: DataTypes.JSONB, allowNull: false },
      mapping: { type: DataTypes.JSONB, allowNull: false },
      leftOut: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'imports', underscored: true })
  }
}

/** The column mapping an organisation used last, proposed for its next file. */
export class ImportMappingRow extends Model<InferAttributes<ImportMappingRow>, InferCreationAttributes<ImportMappingRow>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare mapping: object
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    ImportMappingRow.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      mapping: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'import_mappings', underscored: true })
  }
}
