import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { loadContent } from '../../content/load';
import { alphaFitFromFile, effectiveDriftProfile, fleetRobotFor, SAMPLE_DIR, SAMPLE_FILES, umbmarkFromFile } from '../../services/fleet-profiles';
import type { Migration } from '../migrate';
import { DEMO_DOMAIN, DEMO_ORGANIZATION } from './0001-demo-organization';

export const DEMO_FLEET_PROFILE = 'Tugger T-07, hall B (simulated runs)';
export const DEMO_FLEET_TRIAL = 'wash-bay-crossing';

/**
 * A fleet profile for the demo organization, fitted by the server's own code from the simulated
 * sample files in content/calibration-samples (invented data), with one practice trial.
 */
export const demoFleetProfile: Migration = {
  name: '0003-demo-fleet-profile',
  async up({ context: sequelize }) {
    const content = loadContent();
    const { robot, base } = fleetRobotFor(content, { robotId: 'aisle-tugger' });
    const runs = readFileSync(path.join(SAMPLE_DIR, SAMPLE_FILES.umbmark));
    const poses = readFileSync(path.join(SAMPLE_DIR, SAMPLE_FILES.poses));
    const umbmark = umbmarkFromFile(robot, runs);
    const alphaFit = await alphaFitFromFile(poses);
    const driftProfile = effectiveDriftProfile(base, umbmark, alphaFit);
    const id = randomUUID();
    await sequelize.transaction(async (transaction) => {
      const [[owner]] = (await sequelize.query(
        `SELECT o.id AS "organizationId", u.id AS "userId" FROM organizations o JOIN users u ON u.organization_id = o.id
         WHERE o.name = :org AND u.email = :employer`,
        { replacements: { org: DEMO_ORGANIZATION, employer: `employer@${DEMO_DOMAIN}` }, transaction },
      )) as [{ organizationId: number; userId: number }[], unknown];
      if (!owner) return;
      await sequelize.query(
        `INSERT INTO fleet_profiles (id, organization_id, name, robot, drift_profile, umbmark_report, alpha_fit_report, created_by)
         VALUES (:id, :organizationId, :name, :robot, :driftProfile, :umbmark, :alphaFit, :userId)`,
        {
          replacements: {
            id,
            ...owner,
            name: DEMO_FLEET_PROFILE,
            robot: JSON.stringify(robot),
            driftProfile: JSON.stringify(driftProfile),
            umbmark: JSON.stringify(umbmark.report),
            alphaFit: JSON.stringify(alphaFit),
          },
          transaction,
        },
      );
      for (const [kind, bytes] of [['umbmark', runs], ['poses', poses]] as const) {
        await sequelize.query('INSERT INTO fleet_profile_files (profile_id, kind, file_name, bytes) VALUES (:id, :kind, :fileName, :bytes)', {
          replacements: { id, kind, fileName: SAMPLE_FILES[kind], bytes },
          transaction,
        });
      }
      await sequelize.query('INSERT INTO fleet_practice_trials (profile_id, trial_id, assigned_by) VALUES (:id, :trialId, :userId)', {
        replacements: { id, trialId: DEMO_FLEET_TRIAL, userId: owner.userId },
        transaction,
      });
    });
  },
};
