import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Organisation } from './organisation'

export class Show extends Model<InferAttributes<Show>, InferCreationAttributes<Show>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare name: string
  declare club: string | null
  declare firstDay: string
  declare lastDay: string
  declare place: string | null
  declare judges: CreationOptional<string[]>
  declare timeZone: string
  /** The moment entries close, stored in UTC; shown in the show's time zone. */
  declare entriesCloseAt: Date | null
  declare notes: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Show.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(160), allowNull: false },
      club: { type: DataTypes.STRING(160), allowNull: true },
      firstDay: { type: DataTypes.DATEONLY, allowNull: false },
      lastDay: { type: DataTypes.DATEONLY, allowNull: false },
      place: { type: DataTypes.STRING(200), allowNull: true },
      judges: { type: DataTypes.ARRAY(DataTypes.STRING(120)), allowNull: false, defaultValue: [] },
      timeZone: { type: DataTypes.STRING(64), allowNull: false },
      entriesCloseAt: { type: DataTypes.DATE, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'shows' })
  }
}
