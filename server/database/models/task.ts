import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { WorkKind } from '../../../shared/coat'
import type { TaskStatus } from '../../../shared/types/kennel'
import type { Dog } from './dog'
import type { Organisation } from './organisation'
import type { User } from './user'

export class Task extends Model<InferAttributes<Task>, InferCreationAttributes<Task>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare dogId: ForeignKey<Dog['id']>
  declare kind: WorkKind
  declare regions: string[]
  declare dueDate: string
  declare windowStart: string | null
  declare windowEnd: string | null
  declare assigneeId: ForeignKey<User['id']> | null
  declare createdById: ForeignKey<User['id']> | null
  declare status: CreationOptional<TaskStatus>
  declare skipReason: string | null
  declare minutes: number | null
  declare notes: string | null
  declare planStepKey: string | null
  declare coatWorkId: number | null
  declare doneAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare dog?: NonAttribute<Dog>
  declare assignee?: NonAttribute<User | null>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Task.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      kind: { type: DataTypes.STRING(10), allowNull: false },
      regions: { type: DataTypes.ARRAY(DataTypes.STRING(40)), allowNull: false },
      dueDate: { type: DataTypes.DATEONLY, allowNull: false },
      windowStart: { type: DataTypes.TIME, allowNull: true },
      windowEnd: { type: DataTypes.TIME, allowNull: true },
      status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'open' },
      skipReason: { type: DataTypes.TEXT, allowNull: true },
      minutes: { type: DataTypes.INTEGER, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: true },
      planStepKey: { type: DataTypes.STRING(200), allowNull: true },
      coatWorkId: { type: DataTypes.INTEGER, allowNull: true },
      doneAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'tasks' })
  }
}
