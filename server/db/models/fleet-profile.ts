import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { UmbmarkReport } from '../../../shared/calibration';
import type { AlphaFitView, DriftProfile, FleetFileKind, FleetProfileStatus, FleetRobot } from '../../../shared/schemas';

/** An organization's own drift profile, fitted on the server from its calibration files. */
export class FleetProfile extends Model<InferAttributes<FleetProfile>, InferCreationAttributes<FleetProfile>> {
  declare id: string;
  declare organizationId: number;
  declare name: string;
  declare status: CreationOptional<FleetProfileStatus>;
  declare robot: FleetRobot;
  /** The effective profile drives run with (alphas, Ed, Eb). */
  declare driftProfile: DriftProfile;
  declare umbmarkReport: UmbmarkReport | null;
  /** The report as the API shows it (residuals thinned); the file it came from is kept. */
  declare alphaFitReport: AlphaFitView | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FleetProfile.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.ENUM('active', 'archived'), allowNull: false, defaultValue: 'active' },
        robot: { type: DataTypes.JSONB, allowNull: false },
        driftProfile: { type: DataTypes.JSONB, allowNull: false },
        umbmarkReport: { type: DataTypes.JSONB, allowNull: true },
        alphaFitReport: { type: DataTypes.JSONB, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      // The reports can be large (residuals): lists leave them out.
      { sequelize, tableName: 'fleet_profiles', underscored: true, scopes: { summary: { attributes: { exclude: ['umbmarkReport', 'alphaFitReport'] } } } },
    );
  }
}

/** A calibration file a fleet profile was fitted from, kept byte for byte. */
export class FleetProfileFile extends Model<InferAttributes<FleetProfileFile>, InferCreationAttributes<FleetProfileFile>> {
  declare profileId: string;
  declare kind: FleetFileKind;
  /** The name the file was uploaded with (made safe). */
  declare fileName: string;
  declare bytes: Buffer;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FleetProfileFile.init(
      {
        profileId: { type: DataTypes.UUID, primaryKey: true },
        kind: { type: DataTypes.ENUM('umbmark', 'poses'), primaryKey: true },
        fileName: { type: DataTypes.TEXT, allowNull: false },
        bytes: { type: DataTypes.BLOB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'fleet_profile_files', underscored: true, updatedAt: false },
    );
  }
}

/** A practice trial an organization's operators drive on one of its fleet profiles. */
export class FleetPracticeTrial extends Model<InferAttributes<FleetPracticeTrial>, InferCreationAttributes<FleetPracticeTrial>> {
  declare profileId: string;
  declare trialId: string;
  declare assignedBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    FleetPracticeTrial.init(
      {
        profileId: { type: DataTypes.UUID, primaryKey: true },
        trialId: { type: DataTypes.TEXT, primaryKey: true },
        assignedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'fleet_practice_trials', underscored: true, updatedAt: false },
    );
  }
}
