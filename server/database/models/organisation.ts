import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { OrganisationKind, RuleSet } from '../../../shared/types/organisation'

export class Organisation extends Model<InferAttributes<Organisation>, InferCreationAttributes<Organisation>> {
  declare id: CreationOptional<number>
  declare name: string
  declare kind: OrganisationKind
  declare timeZone: string
  declare ruleSet: RuleSet
  /** ISO weekday (1 = Monday) and hour, in the organisation's time zone, of the weekly status. */
  declare weeklyDay: CreationOptional<number>
  declare weeklyHour: CreationOptional<number>
  declare weeklyEnabled: CreationOptional<boolean>
  declare weeklyToAssistants: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Organisation.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      kind: { type: DataTypes.STRING(10), allowNull: false },
      timeZone: { type: DataTypes.STRING(64), allowNull: false },
      ruleSet: { type: DataTypes.STRING(3), allowNull: false },
      weeklyDay: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 1 },
      weeklyHour: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 7 },
      weeklyEnabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      weeklyToAssistants: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'organisations', underscored: true })
  }
}
