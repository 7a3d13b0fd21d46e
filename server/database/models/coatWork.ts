import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { WorkKind } from '../../../shared/coat'
import type { Dog } from './dog'
import type { Organisation } from './organisation'
import type { User } from './user'

export class CoatWorkRow extends Model<InferAttributes<CoatWorkRow>, InferCreationAttributes<CoatWorkRow>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare dogId: ForeignKey<Dog['id']>
  declare date: string
  declare kind: WorkKind
  declare regions: string[]
  declare workedById: ForeignKey<User['id']> | null
  declare recordedById: ForeignKey<User['id']> | null
  declare minutes: number | null
  declare notes: string | null
  declare taskId: number | null
  declare deletedAt: CreationOptional<Date | null>
  declare deletedById: ForeignKey<User['id']> | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare workedBy?: NonAttribute<User | null>

  /** Registers the model on a Sequelize instance. Soft-deleted rows stay, and default queries skip them. */
  static setup(sequelize: Sequelize) {
    CoatWorkRow.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      date: { type: DataTypes.DATEONLY, allowNull: false },
      kind: { type: DataTypes.STRING(10), allowNull: false },
      regions: { type: DataTypes.ARRAY(DataTypes.STRING(40)), allowNull: false },
      minutes: { type: DataTypes.INTEGER, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: true },
      taskId: { type: DataTypes.INTEGER, allowNull: true },
      deletedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'coat_work', modelName: 'CoatWork', paranoid: true })
  }
}
