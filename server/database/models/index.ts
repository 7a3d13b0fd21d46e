import type { Sequelize } from 'sequelize'
import { getSequelize } from '../connection'
import { Membership } from './membership'
import { Organisation } from './organisation'
import { SignInFailure, SignInLock } from './signInAttempt'
import { User } from './user'

export { Membership, Organisation, SignInFailure, SignInLock, User }

let ready: Sequelize | undefined

/** Registers every model and association once, on the process's Sequelize instance. */
export function initModels(sequelize: Sequelize = getSequelize()) {
  if (ready === sequelize) return { sequelize, Organisation, User, Membership, SignInFailure, SignInLock }
  Organisation.setup(sequelize)
  User.setup(sequelize)
  Membership.setup(sequelize)
  SignInFailure.setup(sequelize)
  SignInLock.setup(sequelize)

  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Organisation.hasMany(Membership, { foreignKey: 'organisationId', as: 'memberships' })
  Membership.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' })

  ready = sequelize
  return { sequelize, Organisation, User, Membership, SignInFailure, SignInLock }
}
