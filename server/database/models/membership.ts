import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Role } from '../../../shared/types/organisation'
import type { Organisation } from './organisation'
import type { User } from './user'

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<User['id']>
  declare organisationId: ForeignKey<Organisation['id']>
  declare role: Role
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare user?: NonAttribute<User>
  declare organisation?: NonAttribute<Organisation>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Membership.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      role: { type: DataTypes.STRING(10), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'memberships' })
  }
}
