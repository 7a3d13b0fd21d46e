import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** One sign-in try for an e-mail address (removed when one succeeds), kept in PostgreSQL so every app instance counts the same. */
export class SignInFailure extends Model<InferAttributes<SignInFailure>, InferCreationAttributes<SignInFailure>> {
  declare id: CreationOptional<number>
  declare email: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    SignInFailure.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'sign_in_failures' })
  }
}

/** An e-mail address that may not sign in until `lockedUntil`. */
export class SignInLock extends Model<InferAttributes<SignInLock>, InferCreationAttributes<SignInLock>> {
  declare email: string
  declare lockedUntil: Date
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    SignInLock.init({
      email: { type: DataTypes.STRING(254), primaryKey: true },
      lockedUntil: { type: DataTypes.DATE, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'sign_in_locks' })
  }
}
