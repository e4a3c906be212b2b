import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { AttemptScore as Score } from '../../../shared/scoring';

export type ReviewStatus = 'not_required' | 'awaiting' | 'in_review' | 'confirmed' | 'amended' | 'voided';

/** The score of a submitted attempt, as the engine computed it, and the final result after any review. */
export class AttemptScore extends Model<InferAttributes<AttemptScore>, InferCreationAttributes<AttemptScore>> {
  declare attemptId: string;
  declare version: string;
  declare result: Score;
  declare total: number;
  declare passed: boolean;
  declare flagged: boolean;
  declare reviewStatus: ReviewStatus;
  /** The result that counts: the engine's, or the assessor's amended one; null until final. */
  declare finalResult: Score | null;
  declare finalPassed: boolean | null;
  declare finalizedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    AttemptScore.init(
      {
        attemptId: { type: DataTypes.UUID, primaryKey: true },
        version: { type: DataTypes.TEXT, allowNull: false },
        result: { type: DataTypes.JSONB, allowNull: false },
        total: {
          type: DataTypes.DECIMAL(5, 1),
          allowNull: false,
          get() {
            return Number(this.getDataValue('total'));
          },
        },
        passed: { type: DataTypes.BOOLEAN, allowNull: false },
        flagged: { type: DataTypes.BOOLEAN, allowNull: false },
        reviewStatus: { type: DataTypes.ENUM('not_required', 'awaiting', 'in_review', 'confirmed', 'amended', 'voided'), allowNull: false },
        finalResult: { type: DataTypes.JSONB, allowNull: true },
        finalPassed: { type: DataTypes.BOOLEAN, allowNull: true },
        finalizedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'attempt_scores', underscored: true },
    );
  }
}
