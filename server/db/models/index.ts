import type { Sequelize } from 'sequelize';
import { Attempt } from './attempt';
import { AttemptLogEntry } from './attempt-log-entry';
import { AttemptReview } from './attempt-review';
import { AttemptScore } from './attempt-score';
import { ReviewAuditEntry } from './review-audit-entry';
import { Credential } from './credential';
import { FleetPracticeTrial, FleetProfile, FleetProfileFile } from './fleet-profile';
import { LevelAssignment } from './level-assignment';
import { SeatLedgerEntry } from './seat-ledger-entry';
import { SeatOrder } from './seat-order';
import { MailMessage } from './mail-message';
import { Organization } from './organization';
import { PasswordToken } from './password-token';
import { User } from './user';

export { Attempt, AttemptLogEntry, AttemptReview, AttemptScore, Credential, FleetPracticeTrial, FleetProfile, FleetProfileFile, LevelAssignment, ReviewAuditEntry, SeatLedgerEntry, SeatOrder, MailMessage, Organization, PasswordToken, User };

/** Registers every model and association on a Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  Organization.initModel(sequelize);
  User.initModel(sequelize);
  PasswordToken.initModel(sequelize);
  MailMessage.initModel(sequelize);
  Attempt.initModel(sequelize);
  AttemptLogEntry.initModel(sequelize);
  SeatLedgerEntry.initModel(sequelize);
  SeatOrder.initModel(sequelize);
  LevelAssignment.initModel(sequelize);
  Credential.initModel(sequelize);
  AttemptScore.initModel(sequelize);
  AttemptReview.initModel(sequelize);
  ReviewAuditEntry.initModel(sequelize);
  FleetProfile.initModel(sequelize);
  FleetProfileFile.initModel(sequelize);
  FleetPracticeTrial.initModel(sequelize);

  Organization.hasMany(User, { foreignKey: 'organizationId', as: 'users' });
  User.belongsTo(Organization, { foreignKey: 'organizationId', as: 'organization' });
  User.hasMany(PasswordToken, { foreignKey: 'userId', as: 'passwordTokens' });
  PasswordToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Attempt.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Attempt.hasOne(AttemptScore, { foreignKey: 'attemptId', as: 'score' });
  AttemptScore.belongsTo(Attempt, { foreignKey: 'attemptId', as: 'attempt' });
  AttemptScore.hasOne(AttemptReview, { foreignKey: 'attemptId', sourceKey: 'attemptId', as: 'review' });
  Attempt.hasOne(AttemptReview, { foreignKey: 'attemptId', as: 'review' });
  AttemptReview.belongsTo(User, { foreignKey: 'assessorId', as: 'assessor' });
  ReviewAuditEntry.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  Credential.belongsTo(User, { foreignKey: 'userId', as: 'holder' });
  Credential.belongsTo(Organization, { foreignKey: 'organizationId', as: 'organization' });
  FleetProfile.belongsTo(User, { foreignKey: 'createdBy', as: 'creator' });
  FleetProfile.hasMany(FleetProfileFile, { foreignKey: 'profileId', as: 'files' });
  FleetProfile.hasMany(FleetPracticeTrial, { foreignKey: 'profileId', as: 'practiceTrials' });
  Attempt.belongsTo(FleetProfile, { foreignKey: 'fleetProfileId', as: 'fleetProfile' });
}
