import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { CapturedMail, CapturedMailSummary } from '../../../shared/schemas';

/** A message the local mail sink received over SMTP. */
export class MailMessage extends Model<InferAttributes<MailMessage>, InferCreationAttributes<MailMessage>> {
  declare id: CreationOptional<number>;
  declare messageId: string | null;
  declare envelopeFrom: string;
  declare envelopeTo: string;
  declare fromHeader: string;
  declare toHeader: string;
  declare subject: string;
  declare textBody: string | null;
  declare htmlBody: string | null;
  declare sizeBytes: number;
  declare receivedAt: CreationOptional<Date>;

  toSummary(): CapturedMailSummary {
    return {
      id: this.id,
      from: this.fromHeader,
      to: this.toHeader,
      subject: this.subject,
      receivedAt: this.receivedAt.toISOString(),
    };
  }

  toPublic(): CapturedMail {
    return { ...this.toSummary(), text: this.textBody, html: this.htmlBody };
  }

  static initModel(sequelize: Sequelize) {
    MailMessage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        messageId: { type: DataTypes.TEXT, allowNull: true },
        envelopeFrom: { type: DataTypes.TEXT, allowNull: false },
        envelopeTo: { type: DataTypes.TEXT, allowNull: false },
        fromHeader: { type: DataTypes.TEXT, allowNull: false },
        toHeader: { type: DataTypes.TEXT, allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false },
        textBody: { type: DataTypes.TEXT, allowNull: true },
        htmlBody: { type: DataTypes.TEXT, allowNull: true },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'mail_messages', underscored: true, timestamps: false },
    );
  }
}
