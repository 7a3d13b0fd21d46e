import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { StoredRegion } from '../../../shared/types/kennel'
import type { Organisation } from './organisation'

export class CoatProfileRow extends Model<InferAttributes<CoatProfileRow>, InferCreationAttributes<CoatProfileRow>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare key: string
  declare label: string
  declare toleranceDays: number
  declare onTrackScore: number
  declare regions: StoredRegion[]
  declare isDefault: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    CoatProfileRow.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      key: { type: DataTypes.STRING(60), allowNull: false },
      label: { type: DataTypes.STRING(120), allowNull: false },
      toleranceDays: { type: DataTypes.INTEGER, allowNull: false },
      onTrackScore: { type: DataTypes.INTEGER, allowNull: false },
      regions: { type: DataTypes.JSONB, allowNull: false },
      isDefault: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'coat_profiles', modelName: 'CoatProfile' })
  }
}
