import type { Sequelize } from 'sequelize'
import { getSequelize } from '../connection'
import { AuditEvent } from './auditEvent'
import { CalendarFeed } from './calendarFeed'
import { CoatProfileRow } from './coatProfile'
import { CoatWorkRow } from './coatWork'
import { Dog } from './dog'
import { Entry } from './entry'
import { ImportMappingRow, ImportRecord } from './import'
import { DemoMail, Invitation, MailOutbox, MailUnsubscribe, PasswordReset } from './mail'
import { Membership } from './membership'
import { Organisation } from './organisation'
import { Show } from './show'
import { SignInFailure, SignInLock } from './signInAttempt'
import { Task } from './task'
import { User } from './user'

export { AuditEvent, CalendarFeed, DemoMail, Invitation, MailOutbox, MailUnsubscribe, PasswordReset, CoatProfileRow, CoatWorkRow, Dog, Entry, ImportMappingRow, ImportRecord, Membership, Organisation, Show, SignInFailure, SignInLock, Task, User }

const models = { Organisation, User, Membership, SignInFailure, SignInLock, CoatProfileRow, Dog, CoatWorkRow, Show, Entry, Task, AuditEvent, ImportRecord, ImportMappingRow, CalendarFeed, MailOutbox, Invitation, PasswordReset, MailUnsubscribe, DemoMail }
let ready: Sequelize | undefined

/** Registers every model and association once, on the process's Sequelize instance. */
export function initModels(sequelize: Sequelize = getSequelize()) {
  if (ready === sequelize) return { sequelize, ...models }
  Organisation.setup(sequelize)
  User.setup(sequelize)
  Membership.setup(sequelize)
  SignInFailure.setup(sequelize)
  SignInLock.setup(sequelize)
  CoatProfileRow.setup(sequelize)
  Dog.setup(sequelize)
  CoatWorkRow.setup(sequelize)
  Show.setup(sequelize)
  Entry.setup(sequelize)
  Task.setup(sequelize)
  AuditEvent.setup(sequelize)
  ImportRecord.setup(sequelize)
  ImportMappingRow.setup(sequelize)
  CalendarFeed.setup(sequelize)
  MailOutbox.setup(sequelize)
  Invitation.setup(sequelize)
  PasswordReset.setup(sequelize)
  MailUnsubscribe.setup(sequelize)
  DemoMail.setup(sequelize)

  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Organisation.hasMany(Membership, { foreignKey: 'organisationId', as: 'memberships' })
  Membership.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' })

  const inOrganisation = { foreignKey: 'organisationId', as: 'organisation' }
  CoatProfileRow.belongsTo(Organisation, inOrganisation)
  Dog.belongsTo(Organisation, inOrganisation)
  CoatWorkRow.belongsTo(Organisation, inOrganisation)
  Show.belongsTo(Organisation, inOrganisation)
  Entry.belongsTo(Organisation, inOrganisation)
  Task.belongsTo(Organisation, inOrganisation)
  AuditEvent.belongsTo(Organisation, inOrganisation)
  ImportRecord.belongsTo(Organisation, inOrganisation)
  ImportMappingRow.belongsTo(Organisation, inOrganisation)
  ImportRecord.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Dog.belongsTo(User, { foreignKey: 'handlerId', as: 'handler' })
  Dog.belongsTo(CoatProfileRow, { foreignKey: 'coatProfileId', as: 'coatProfile' })
  Dog.hasMany(CoatWorkRow, { foreignKey: 'dogId', as: 'work' })
  Dog.hasMany(Entry, { foreignKey: 'dogId', as: 'entries' })
  Dog.hasMany(Task, { foreignKey: 'dogId', as: 'tasks' })
  CoatWorkRow.belongsTo(Dog, { foreignKey: 'dogId', as: 'dog' })
  CoatWorkRow.belongsTo(User, { foreignKey: 'workedById', as: 'workedBy' })
  CoatWorkRow.belongsTo(User, { foreignKey: 'recordedById', as: 'recordedBy' })
  CoatWorkRow.belongsTo(User, { foreignKey: 'deletedById', as: 'deletedBy' })
  Show.hasMany(Entry, { foreignKey: 'showId', as: 'entries' })
  Entry.belongsTo(Show, { foreignKey: 'showId', as: 'show' })
  Entry.belongsTo(Dog, { foreignKey: 'dogId', as: 'dog' })
  Entry.belongsTo(User, { foreignKey: 'handlerId', as: 'handler' })
  Task.belongsTo(Dog, { foreignKey: 'dogId', as: 'dog' })
  Task.belongsTo(User, { foreignKey: 'assigneeId', as: 'assignee' })
  Task.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' })
  AuditEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' })
  Invitation.belongsTo(Organisation, inOrganisation)
  Invitation.belongsTo(User, { foreignKey: 'invitedById', as: 'invitedBy' })
  PasswordReset.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  MailUnsubscribe.belongsTo(User, { foreignKey: 'userId', as: 'user' })

  ready = sequelize
  return { sequelize, ...models }
}
