/**
 * The Ed25519 key that signs credentials (node:crypto). CREDENTIAL_SIGNING_KEY (a PKCS#8 PEM)
 * when set; otherwise one key made on first use and kept in the settings table, so that every
 * process of an installation signs and verifies with the same key.
 */
import { createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import type { AppContext } from '../context';

interface KeyPair {
  privateKey: KeyObject;
  publicKey: KeyObject;
}

let cached: Promise<KeyPair> | undefined;

async function loadKey(ctx: AppContext): Promise<KeyPair> {
  const fromEnv = process.env.CREDENTIAL_SIGNING_KEY;
  let pem = fromEnv;
  if (!pem) {
    const fresh = generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    await ctx.sequelize.query(`INSERT INTO settings (key, value) VALUES ('credential_signing_key', :value) ON CONFLICT (key) DO NOTHING`, {
      replacements: { value: JSON.stringify({ pem: fresh }) },
    });
    const [row] = await ctx.sequelize.query<{ value: { pem: string } }>(`SELECT value FROM settings WHERE key = 'credential_signing_key'`, { type: QueryTypes.SELECT });
    pem = row.value.pem;
  }
  const privateKey = createPrivateKey(pem);
  return { privateKey, publicKey: createPublicKey(privateKey) };
}

export function signingKey(ctx: AppContext): Promise<KeyPair> {
  cached ??= loadKey(ctx).catch((error) => {
    cached = undefined;
    throw error;
  });
  return cached;
}

export async function signText(ctx: AppContext, text: string): Promise<string> {
  return sign(null, Buffer.from(text, 'utf8'), (await signingKey(ctx)).privateKey).toString('base64url');
}

export async function signatureValid(ctx: AppContext, text: string, signature: string): Promise<boolean> {
  try {
    return verify(null, Buffer.from(text, 'utf8'), (await signingKey(ctx)).publicKey, Buffer.from(signature, 'base64url'));
  } catch {
    return false;
  }
}

/** A short, human-comparable code of a signature for the printed certificate. */
export const signatureCode = (signature: string) => signature.slice(0, 12).replace(/(.{4})/g, '$1 ').trim();
