import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { DogSex, DogStatus } from '../../../shared/types/kennel'
import type { CoatProfileRow } from './coatProfile'
import type { Organisation } from './organisation'
import type { User } from './user'

export class Dog extends Model<InferAttributes<Dog>, InferCreationAttributes<Dog>> {
  declare id: CreationOptional<number>
  declare organisationId: ForeignKey<Organisation['id']>
  declare callName: string
  declare registeredName: string
  declare registrationNumber: string | null
  declare breed: string
  declare sex: DogSex
  declare dateOfBirth: string
  declare colour: string | null
  declare ownerName: string | null
  declare ownerEmail: string | null
  declare ownerPhone: string | null
  declare handlerId: ForeignKey<User['id']> | null
  declare coatProfileId: ForeignKey<CoatProfileRow['id']>
  declare notes: string | null
  declare status: CreationOptional<DogStatus>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare handler?: NonAttribute<User | null>
  declare coatProfile?: NonAttribute<CoatProfileRow>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Dog.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      callName: { type: DataTypes.STRING(60), allowNull: false },
      registeredName: { type: DataTypes.STRING(160), allowNull: false },
      registrationNumber: { type: DataTypes.STRING(40), allowNull: true },
      breed: { type: DataTypes.STRING(80), allowNull: false },
      sex: { type: DataTypes.STRING(5), allowNull: false },
      dateOfBirth: { type: DataTypes.DATEONLY, allowNull: false },
      colour: { type: DataTypes.STRING(60), allowNull: true },
      ownerName: { type: DataTypes.STRING(120), allowNull: true },
      ownerEmail: { type: DataTypes.STRING(254), allowNull: true },
      ownerPhone: { type: DataTypes.STRING(40), allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: true },
      status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'active' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'dogs' })
  }
}
