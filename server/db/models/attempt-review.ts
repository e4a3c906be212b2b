import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Amendment } from '../../../shared/scoring';

export type Verdict = 'confirm' | 'amend' | 'void';

/** An assessor's claim on an attempt and, once signed, their verdict. A signed review never changes. */
export class AttemptReview extends Model<InferAttributes<AttemptReview>, InferCreationAttributes<AttemptReview>> {
  declare attemptId: string;
  declare assessorId: number;
  declare claimedAt: CreationOptional<Date>;
  declare verdict: Verdict | null;
  declare reason: string | null;
  declare amendments: CreationOptional<Amendment[]>;
  declare signedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    AttemptReview.init(
      {
        attemptId: { type: DataTypes.UUID, primaryKey: true },
        assessorId: { type: DataTypes.INTEGER, allowNull: false },
        claimedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        verdict: { type: DataTypes.ENUM('confirm', 'amend', 'void'), allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: true },
        amendments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        signedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'attempt_reviews', underscored: true, timestamps: false },
    );
  }
}
