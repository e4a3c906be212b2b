/** The shapes of credentials as the API sends them (server/services/credentials.ts builds them). */
import type { CredentialStatus } from '../credentials/status';

export type { CredentialStatus };

/** One required trial of the level, passed in an exam drive. */
export interface CredentialTrial {
  trialId: string;
  title: string;
  attemptId: string;
  passedAt: string;
}

/** A credential as GET /api/credentials lists it. */
export interface CredentialView {
  id: number;
  number: string;
  holderName: string;
  userId: number;
  organizationId: number | null;
  organizationName: string | null;
  levelId: string;
  levelName: string;
  trials: CredentialTrial[];
  issuedAt: string;
  expiresAt: string;
  status: CredentialStatus;
  revokedAt: string | null;
  revokeReason: string | null;
}

/** The public answer for a number that exists (an unknown number answers 404 `not_found`). */
export interface CredentialCheck {
  found: true;
  number: string;
  holderName: string;
  levelName: string;
  organizationName: string | null;
  issuedAt: string;
  expiresAt: string;
  status: CredentialStatus;
  revokedAt: string | null;
  /** The record matches its signature under Driftproof's key. */
  signatureValid: boolean;
  /** Only when the QR link's signature was sent: whether it is the one on record. */
  printedSignatureMatches?: boolean;
}

/** What a public look-up finds: the credential, or nothing. */
export type Verification = CredentialCheck | { found: false };

/** One row of a bulk verification, in the order of the file (`line` counts the header as 1). */
export interface BulkCheckRow {
  line: number;
  number: string;
  name: string | null;
  found: boolean;
  status: CredentialStatus | null;
  holderName: string | null;
  levelName: string | null;
  expiresAt: string | null;
  /** Whether the given name matches the holder (case and accents aside); null when no name was given or the number was not found. */
  nameMatches: boolean | null;
  signatureValid: boolean | null;
}
