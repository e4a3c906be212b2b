import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type SeatEntryKind = 'purchase' | 'grant' | 'exam_start' | 'void_return' | 'refund';

/** One append-only line of an organization's seat ledger; the balance is the sum of the deltas. */
export class SeatLedgerEntry extends Model<InferAttributes<SeatLedgerEntry>, InferCreationAttributes<SeatLedgerEntry>> {
  declare id: CreationOptional<number>;
  declare organizationId: number;
  declare delta: number;
  declare kind: SeatEntryKind;
  declare orderId: string | null;
  declare attemptId: string | null;
  declare actorId: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SeatLedgerEntry.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        delta: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM('purchase', 'grant', 'exam_start', 'void_return', 'refund'), allowNull: false },
        orderId: { type: DataTypes.UUID, allowNull: true },
        attemptId: { type: DataTypes.UUID, allowNull: true },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'seat_ledger', underscored: true, updatedAt: false },
    );
  }
}
