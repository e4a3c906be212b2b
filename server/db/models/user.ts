import {
  DataTypes,
  Model,
  QueryTypes,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { PublicUser, Role } from '../../../shared/schemas';
import type { Organization } from './organization';

type PublicUserFields = Pick<User, 'id' | 'email' | 'name' | 'role' | 'organizationId' | 'active' | 'lastSignInAt' | 'emailConfirmedAt' | 'createdAt'> & {
  organizationName: string | null;
};

/** The one rule for what of an account the API shows: never the password hash. */
function publicUser(u: PublicUserFields): PublicUser {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    organizationId: u.organizationId ?? null,
    organizationName: u.organizationName,
    active: u.active,
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    emailConfirmed: u.emailConfirmedAt != null,
    createdAt: u.createdAt.toISOString(),
  };
}

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
    return publicUser({ ...this.get(), organizationName: this.organization?.name ?? null });
  }

  /**
   * The account behind a session, with its organization's name, in one light query: every signed-in
   * request runs it, so it builds no model instances. Null when the account is gone.
   */
  static async findSignedIn(id: number): Promise<PublicUser | null> {
    const rows = await User.sequelize!.query<PublicUserFields>(
      `SELECT u.id, u.email, u.name, u.role, u.organization_id AS "organizationId", o.name AS "organizationName", u.active,
              u.last_sign_in_at AS "lastSignInAt", u.email_confirmed_at AS "emailConfirmedAt", u.created_at AS "createdAt"
         FROM users u LEFT JOIN organizations o ON o.id = u.organization_id
        WHERE u.id = $1`,
      { bind: [id], type: QueryTypes.SELECT },
    );
    return rows.length ? publicUser(rows[0]) : null;
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
