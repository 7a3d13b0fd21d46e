import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { EntryStatus } from '../../../shared/types/kennel'
import type { Dog } from './dog'
import type { Organisation } from './organisation'
import type { Show } from './show'
import type { User } from './user'

export class Entry extends Model<InferAttributes<Entry>, InferCreationAttributes<Entry>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare dogId: ForeignKey<Dog['id']>
  declare showId: ForeignKey<Show['id']>
  declare classCode: string
  declare armband: string | null
  declare status: CreationOptional<EntryStatus>
  declare handlerId: ForeignKey<User['id']> | null
  declare notes: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare dog?: NonAttribute<Dog>
  declare show?: NonAttribute<Show>
  declare handler?: NonAttribute<User | null>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Entry.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      classCode: { type: DataTypes.STRING(40), allowNull: false },
      armband: { type: DataTypes.STRING(20), allowNull: true },
      status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'planned' },
      notes: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'entries' })
  }
}
