import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Organisation } from './organisation'
import type { User } from './user'

/** One change to a record, kept so that edits and deletions are never silent. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare actorId: ForeignKey<User['id']> | null
  declare entity: string
  declare entityId: number
  declare action: 'create' | 'update' | 'delete' | 'restore'
  declare before: object | null
  declare after: object | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    AuditEvent.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      entity: { type: DataTypes.STRING(30), allowNull: false },
      entityId: { type: DataTypes.INTEGER, allowNull: false },
      action: { type: DataTypes.STRING(20), allowNull: false },
      before: { type: DataTypes.JSONB, allowNull: true },
      after: { type: DataTypes.JSONB, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'audit_events' })
  }
}
