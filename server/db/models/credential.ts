import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { CredentialTrial } from '../../../shared/schemas';

/** A certificate issued for a passed level: numbered, signed, and revocable. */
export class Credential extends Model<InferAttributes<Credential>, InferCreationAttributes<Credential>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare userId: number;
  declare organizationId: number | null;
  declare levelId: string;
  declare holderName: string;
  declare trials: CredentialTrial[];
  declare issuedAt: Date;
  declare expiresAt: Date;
  /** Ed25519 signature (base64url) over signedCredentialText of the fields. */
  declare signature: string;
  declare revokedAt: Date | null;
  declare revokedBy: number | null;
  declare revokeReason: string | null;
  declare pdf: Buffer | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Credential.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.TEXT, allowNull: false, unique: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: true },
        levelId: { type: DataTypes.TEXT, allowNull: false },
        holderName: { type: DataTypes.TEXT, allowNull: false },
        trials: { type: DataTypes.JSONB, allowNull: false },
        issuedAt: { type: DataTypes.DATE, allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        signature: { type: DataTypes.TEXT, allowNull: false },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        revokedBy: { type: DataTypes.INTEGER, allowNull: true },
        revokeReason: { type: DataTypes.TEXT, allowNull: true },
        pdf: { type: DataTypes.BLOB, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'credentials', underscored: true, updatedAt: false, defaultScope: { attributes: { exclude: ['pdf'] } } },
    );
  }
}
