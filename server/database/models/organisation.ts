import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { OrganisationKind, RuleSet } from '../../../shared/types/organisation'

export class Organisation extends Model<InferAttributes<Organisation>, InferCreationAttributes<Organisation>> {
  declare id: CreationOptional<number>
  declare name: string
  declare kind: OrganisationKind
  declare timeZone: string
  declare ruleSet: RuleSet
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
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'organisations' })
  }
}
