import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** An exam seat an admin granted to an operator; used by at most one exam attempt. */
export class ExamSeatGrant extends Model<InferAttributes<ExamSeatGrant>, InferCreationAttributes<ExamSeatGrant>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare grantedBy: number | null;
  declare attemptId: string | null;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ExamSeatGrant.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        grantedBy: { type: DataTypes.INTEGER, allowNull: true },
        attemptId: { type: DataTypes.UUID, allowNull: true },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'exam_seat_grants', underscored: true, updatedAt: false },
    );
  }
}
