import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One line of the append-only review audit log: who did what to an attempt's result, when and why. */
export class ReviewAuditEntry extends Model<InferAttributes<ReviewAuditEntry>, InferCreationAttributes<ReviewAuditEntry>> {
  declare id: CreationOptional<number>;
  declare attemptId: string;
  declare actorId: number | null;
  declare action: string;
  declare reason: string | null;
  declare details: CreationOptional<Record<string, unknown>>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ReviewAuditEntry.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        attemptId: { type: DataTypes.UUID, allowNull: false },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        action: { type: DataTypes.TEXT, allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: true },
        details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'review_audit', underscored: true, updatedAt: false },
    );
  }
}
