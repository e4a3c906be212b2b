import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { PublicUser, Role } from '../../../shared/schemas';
import type { Organization } from './organization';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare organizationId: ForeignKey<Organization['id']> | null;
  declare passwordHash: string | null;
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: Date | null;
  /** When the owner proved the address by a link; null until then (self sign-up only). */
  declare emailConfirmedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare organization?: NonAttribute<Organization | null>;

  /** The shape the API returns: never the password hash. */
  toPublic(): PublicUser {
    return {
      id: this.id,
      email: this.email,
      name: this.name,
      role: this.role,
      organizationId: this.organizationId ?? null,
      organizationName: this.organization?.name ?? null,
      active: this.active,
      lastSignInAt: this.lastSignInAt?.toISOString() ?? null,
      emailConfirmed: this.emailConfirmedAt != null,
      createdAt: this.createdAt.toISOString(),
    };
  }

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.TEXT, allowNull: false, unique: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.ENUM('admin', 'employer', 'operator', 'assessor', 'hr'), allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: true },
        passwordHash: { type: DataTypes.TEXT, allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        emailConfirmedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: DataTypes.NOW },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', underscored: true },
    );
  }
}
