import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A level an employer asked an operator to work towards. */
export class LevelAssignment extends Model<InferAttributes<LevelAssignment>, InferCreationAttributes<LevelAssignment>> {
  declare userId: number;
  declare levelId: string;
  declare assignedBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    LevelAssignment.init(
      {
        userId: { type: DataTypes.INTEGER, primaryKey: true },
        levelId: { type: DataTypes.TEXT, primaryKey: true },
        assignedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'level_assignments', underscored: true, updatedAt: false },
    );
  }
}
