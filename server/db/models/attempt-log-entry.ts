import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type AttemptLogKind = 'steps' | 'call' | 'submit' | 'abandon';

/** One stored request of a drive and the answer it got, in order. Append-only. */
export class AttemptLogEntry extends Model<InferAttributes<AttemptLogEntry>, InferCreationAttributes<AttemptLogEntry>> {
  declare attemptId: string;
  declare entryNo: number;
  declare kind: AttemptLogKind;
  declare fromSeq: number | null;
  declare request: unknown;
  declare response: unknown;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    AttemptLogEntry.init(
      {
        attemptId: { type: DataTypes.UUID, primaryKey: true },
        entryNo: { type: DataTypes.INTEGER, primaryKey: true },
        kind: { type: DataTypes.ENUM('steps', 'call', 'submit', 'abandon'), allowNull: false },
        fromSeq: { type: DataTypes.INTEGER, allowNull: true },
        request: { type: DataTypes.JSONB, allowNull: false },
        response: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'attempt_log', underscored: true, updatedAt: false },
    );
  }
}
