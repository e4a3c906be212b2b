export type CredentialStatus = 'active' | 'expired' | 'revoked';

/** Revoked wins; otherwise expired from the expiry instant on. */
export function credentialStatus(expiresAt: Date, revokedAt: Date | null, now: Date = new Date()): CredentialStatus {
  if (revokedAt) return 'revoked';
  return now.getTime() >= expiresAt.getTime() ? 'expired' : 'active';
}

/** The fields the Ed25519 signature covers, in a fixed order, as one line of text. */
export function signedCredentialText(c: { number: string; holderName: string; levelId: string; issuedAt: string; expiresAt: string }): string {
  return ['driftproof-credential-v1', c.number, c.holderName, c.levelId, c.issuedAt, c.expiresAt].join('|');
}
