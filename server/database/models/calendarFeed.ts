import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Organisation } from './organisation'
import type { User } from './user'

/** A person's private calendar feed in one organisation, known by the hash of its secret token. */
export class CalendarFeed extends Model<InferAttributes<CalendarFeed>, InferCreationAttributes<CalendarFeed>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<User['id']>
  declare organisationId: ForeignKey<Organisation['id']>
  declare tokenHash: string
  declare revokedAt: CreationOptional<Date | null>
  declare lastUsedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    CalendarFeed.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      organisationId: { type: DataTypes.INTEGER, allowNull: false },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'calendar_feeds', underscored: true })
  }
}
