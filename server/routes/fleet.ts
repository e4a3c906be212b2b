import { Router, type Request } from 'express';
import { z } from 'zod';
import {
  fleetFileParamsSchema,
  fleetProfileFieldsSchema,
  fleetProfileParamsSchema,
  fleetRobotFieldsSchema,
  fleetSampleParamsSchema,
  idSchema,
  practiceTrialsSchema,
} from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { closedSignal } from '../http/closed-signal';
import { readUploads } from '../http/upload';
import { parseBody, parseParams } from '../http/validate';
import {
  archiveFleetProfile,
  createFleetProfile,
  FLEET_UPLOADS,
  fleetPracticeFor,
  fleetProfileDetail,
  fleetProfileFile,
  listFleetProfiles,
  previewAlphaFit,
  previewUmbmark,
  sampleFile,
  setPracticeTrials,
} from '../services/fleet-profiles';

const orgParams = z.strictObject({ orgId: idSchema });
const orgId = (req: Request) => parseParams(orgParams.loose(), req).orgId;
const noFields = z.strictObject({});

/** Sends a CSV file as a download under a safe name. */
function sendCsv(res: import('express').Response, file: { fileName: string; bytes: Buffer }) {
  res.type('text/csv').attachment(file.fileName).send(file.bytes);
}

export function fleetRoutes(ctx: AppContext) {
  const router = Router();
  // Employers of the organization change and preview; its employers and admins read.
  const ownEmployer = guard(['employer'], { organizationId: (req) => orgId(req) });
  const ownEmployerOrAdmin = guard(['employer', 'admin'], { organizationId: (req) => orgId(req) });
  const base = '/organizations/:orgId';

  router.post(`${base}/fleet-calibration/umbmark`, ownEmployer, async (req, res) => {
    const { runs } = await readUploads(req, res, [FLEET_UPLOADS.runs]);
    res.json({ umbmark: previewUmbmark(ctx, parseBody(fleetRobotFieldsSchema, req), runs) });
  });

  router.post(`${base}/fleet-calibration/alpha-fit`, ownEmployer, async (req, res) => {
    const { poses } = await readUploads(req, res, [FLEET_UPLOADS.poses]);
    parseBody(noFields, req);
    res.json({ alphaFit: await previewAlphaFit(poses, closedSignal(res)) });
  });

  router.post(`${base}/fleet-profiles`, ownEmployer, async (req, res) => {
    const files = await readUploads(req, res, [FLEET_UPLOADS.runs, FLEET_UPLOADS.poses]);
    const fields = parseBody(fleetProfileFieldsSchema, req);
    res.status(201).json({ profile: await createFleetProfile(ctx, currentUser(req), orgId(req), fields, files, closedSignal(res)) });
  });

  router.get(`${base}/fleet-profiles`, ownEmployerOrAdmin, async (req, res) => {
    res.json({ items: await listFleetProfiles(orgId(req)) });
  });

  router.get(`${base}/fleet-profiles/:profileId`, ownEmployerOrAdmin, async (req, res) => {
    const { orgId: organizationId, profileId } = parseParams(fleetProfileParamsSchema, req);
    res.json({ profile: await fleetProfileDetail(organizationId, profileId) });
  });

  router.get(`${base}/fleet-profiles/:profileId/files/:kind`, ownEmployerOrAdmin, async (req, res) => {
    const { orgId: organizationId, profileId, kind } = parseParams(fleetFileParamsSchema, req);
    sendCsv(res, await fleetProfileFile(organizationId, profileId, kind));
  });

  router.put(`${base}/fleet-profiles/:profileId/practice-trials`, ownEmployer, async (req, res) => {
    const { orgId: organizationId, profileId } = parseParams(fleetProfileParamsSchema, req);
    const { trialIds } = parseBody(practiceTrialsSchema, req);
    res.json({ profile: await setPracticeTrials(ctx, currentUser(req), organizationId, profileId, trialIds) });
  });

  router.post(`${base}/fleet-profiles/:profileId/archive`, ownEmployer, async (req, res) => {
    const { orgId: organizationId, profileId } = parseParams(fleetProfileParamsSchema, req);
    res.json({ profile: await archiveFleetProfile(ctx, organizationId, profileId) });
  });

  router.get('/fleet-practice', guard(['operator']), async (req, res) => {
    res.json({ items: await fleetPracticeFor(ctx, currentUser(req)) });
  });

  // Public: simulated sample files, so an employer can see the format before measuring.
  router.get('/fleet-calibration/samples/:kind', async (req, res) => {
    sendCsv(res, await sampleFile(parseParams(fleetSampleParamsSchema, req).kind));
  });

  return router;
}
