import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Role } from '../../../shared/types/organisation'
import type { MailKind, OutboxStatus } from '../../../shared/types/mail'

/** One message on its way out: written first, sent by a job, never sent twice for the same key. */
export class MailOutbox extends Model<InferAttributes<MailOutbox>, InferCreationAttributes<MailOutbox>> {
  declare id: CreationOptional<number>
  declare organisationId: number | null
  declare recipientUserId: number | null
  declare recipientEmail: string
  declare recipientName: string | null
  declare kind: MailKind
  declare periodKey: string
  declare subject: string
  declare html: string
  declare text: string
  declare headers: CreationOptional<Record<string, string>>
  declare status: CreationOptional<OutboxStatus>
  declare attempts: CreationOptional<number>
  declare lastError: CreationOptional<string | null>
  declare lockedUntil: CreationOptional<Date | null>
  declare nextAttemptAt: CreationOptional<Date>
  declare sentAt: CreationOptional<Date | null>
  declare messageId: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    MailOutbox.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true, get() { return Number(this.getDataValue('id')) } },
      organisationId: { type: DataTypes.INTEGER, allowNull: true },
      recipientUserId: { type: DataTypes.INTEGER, allowNull: true },
      recipientEmail: { type: DataTypes.STRING(254), allowNull: false },
      recipientName: { type: DataTypes.STRING(120), allowNull: true },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      periodKey: { type: DataTypes.STRING(60), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      html: { type: DataTypes.TEXT, allowNull: false },
      text: { type: DataTypes.TEXT, allowNull: false },
      headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      lastError: { type: DataTypes.TEXT, allowNull: true },
      lockedUntil: { type: DataTypes.DATE, allowNull: true },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      sentAt: { type: DataTypes.DATE, allowNull: true },
      messageId: { type: DataTypes.STRING(200), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'mail_outbox', underscored: true })
  }
}

/** An invitation to join an organisation with a role, known by the hash of its single-use token. */
export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>
  declare organisationId: number
  declare email: string
  declare name: string | null
  declare role: Role
  declare tokenHash: string
  declare invitedById: number | null
  declare sentCount: CreationOptional<number>
  declare expiresAt: Date
  declare acceptedAt: CreationOptional<Date | null>
  declare acceptedUserId: CreationOptional<number | null>
  declare revokedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    Invitation.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      organisationId: { type: DataTypes.INTEGER, allowNull: false },
      email: { type: DataTypes.STRING(254), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: true },
      role: { type: DataTypes.STRING(10), allowNull: false },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false },
      invitedById: { type: DataTypes.INTEGER, allowNull: true },
      sentCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      acceptedUserId: { type: DataTypes.INTEGER, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'invitations', underscored: true })
  }
}

/** A password-reset link, known by the hash of its single-use token; good for one hour. */
export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>
  declare userId: number
  declare tokenHash: string
  declare expiresAt: Date
  declare usedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    PasswordReset.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'password_resets', underscored: true })
  }
}

/** A person who asked for no more messages of a kind from an organisation. */
export class MailUnsubscribe extends Model<InferAttributes<MailUnsubscribe>, InferCreationAttributes<MailUnsubscribe>> {
  declare userId: number
  declare organisationId: number
  declare kind: MailKind
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    MailUnsubscribe.init({
      userId: { type: DataTypes.INTEGER, primaryKey: true },
      organisationId: { type: DataTypes.INTEGER, primaryKey: true },
      kind: { type: DataTypes.STRING(20), primaryKey: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'mail_unsubscribes', underscored: true })
  }
}

/** A message the demo's own SMTP server received, kept whole (demo mode only). */
export class DemoMail extends Model<InferAttributes<DemoMail>, InferCreationAttributes<DemoMail>> {
  declare id: CreationOptional<number>
  declare envelopeFrom: string | null
  declare envelopeTo: string
  declare subject: string | null
  declare raw: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  /** Registers the model on a Sequelize instance. */
  static setup(sequelize: Sequelize) {
    DemoMail.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true, get() { return Number(this.getDataValue('id')) } },
      envelopeFrom: { type: DataTypes.STRING(254), allowNull: true },
      envelopeTo: { type: DataTypes.TEXT, allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: true },
      raw: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'demo_mailbox', underscored: true })
  }
}
