import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { FleetProfile } from './fleet-profile';
import type { DriveStatus } from '../../../shared/sim';

export type AttemptMode = 'practice' | 'exam';

/** One drive of one trial by one operator. The seeds and the log make it replayable. */
export class Attempt extends Model<InferAttributes<Attempt>, InferCreationAttributes<Attempt>> {
  declare id: string;
  declare userId: number;
  declare organizationId: number | null;
  declare trialId: string;
  declare contentHash: string;
  declare mode: AttemptMode;
  declare status: CreationOptional<DriveStatus>;
  /** Seeds the true motion; never leaves the server before submission. */
  declare secretSeed: string;
  /** Seeds the drift cloud, which the client draws too. */
  declare publicSeed: string;
  declare nextSeq: CreationOptional<number>;
  declare logLength: CreationOptional<number>;
  declare submittedAt: Date | null;
  /** The fleet profile a practice drive runs on (null: the trial's standard drift profile). */
  declare fleetProfileId: CreationOptional<string | null>;
  /** Loaded with `include: 'fleetProfile'` (its id and name) where a summary needs the name. */
  declare fleetProfile?: NonAttribute<FleetProfile | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Attempt.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: true },
        trialId: { type: DataTypes.TEXT, allowNull: false },
        contentHash: { type: DataTypes.TEXT, allowNull: false },
        mode: { type: DataTypes.ENUM('practice', 'exam'), allowNull: false },
        status: { type: DataTypes.ENUM('driving', 'awaiting_call', 'time_up', 'submitted', 'abandoned'), allowNull: false, defaultValue: 'driving' },
        secretSeed: { type: DataTypes.TEXT, allowNull: false },
        publicSeed: { type: DataTypes.TEXT, allowNull: false },
        nextSeq: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        logLength: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        fleetProfileId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'attempts', underscored: true },
    );
  }
}
