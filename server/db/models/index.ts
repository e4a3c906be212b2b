import type { Sequelize } from 'sequelize';
import { MailMessage } from './mail-message';
import { Organization } from './organization';
import { PasswordToken } from './password-token';
import { User } from './user';

export { MailMessage, Organization, PasswordToken, User };

/** Registers every model and association on a Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  Organization.initModel(sequelize);
  User.initModel(sequelize);
  PasswordToken.initModel(sequelize);
  MailMessage.initModel(sequelize);

  Organization.hasMany(User, { foreignKey: 'organizationId', as: 'users' });
  User.belongsTo(Organization, { foreignKey: 'organizationId', as: 'organization' });
  User.hasMany(PasswordToken, { foreignKey: 'userId', as: 'passwordTokens' });
  PasswordToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
}
