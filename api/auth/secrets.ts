import { createPrivateKey, createPublicKey, generateKeyPairSync, randomBytes, type KeyObject } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { ConfigError, type Config } from '../config.js';

export interface Secrets {
  /** HMAC key for API-key secrets and one-time tokens. */
  pepper: Buffer;
  /** Ed25519 key pair that signs and verifies access tokens (EdDSA). */
  jwtPrivateKey: KeyObject;
  jwtPublicKey: KeyObject;
}

interface StoredSecrets {
  pepper: string;
  jwtPrivateKeyPem: string;
}

/**
 * Secrets come from the environment. On the embedded default they are generated once and kept
 * in DATA_DIR — never regenerated, since that would void every key and session. With a real
 * database (several instances) they must be given, so all instances agree.
 */
export function loadSecrets(config: Config): Secrets {
  if (config.keyPepper && config.jwtPrivateKeyPem) return fromValues(config.keyPepper, config.jwtPrivateKeyPem);
  if (config.databaseUrl) {
    throw new ConfigError('Invalid configuration: KEY_PEPPER and JWT_PRIVATE_KEY must be set when DATABASE_URL is used');
  }
  const file = path.join(config.dataDir, 'secrets.json');
  if (!existsSync(file)) {
    mkdirSync(config.dataDir, { recursive: true });
    const { privateKey } = generateKeyPairSync('ed25519');
    const stored: StoredSecrets = {
      pepper: randomBytes(32).toString('base64url'),
      jwtPrivateKeyPem: privateKey.export({ type: 'pkcs8', format: 'pem' }).toString(),
    };
    // wx: never overwrite a file another start wrote first
    writeFileSync(file, JSON.stringify(stored), { mode: 0o600, flag: 'wx' });
  }
  const stored = JSON.parse(readFileSync(file, 'utf8')) as StoredSecrets;
  return fromValues(config.keyPepper ?? stored.pepper, config.jwtPrivateKeyPem ?? stored.jwtPrivateKeyPem);
}

function fromValues(pepper: string, pem: string): Secrets {
  let jwtPrivateKey: KeyObject;
  try {
    jwtPrivateKey = createPrivateKey(pem.replace(/\\n/g, '\n'));
  } catch {
    throw new ConfigError('Invalid configuration: JWT_PRIVATE_KEY must be an Ed25519 private key in PKCS#8 PEM');
  }
  if (jwtPrivateKey.asymmetricKeyType !== 'ed25519') {
    throw new ConfigError('Invalid configuration: JWT_PRIVATE_KEY must be an Ed25519 key');
  }
  return { pepper: Buffer.from(pepper, 'utf8'), jwtPrivateKey, jwtPublicKey: createPublicKey(jwtPrivateKey) };
}

/** Fresh in-memory secrets for tests. */
export function ephemeralSecrets(): Secrets {
  const { privateKey, publicKey } = generateKeyPairSync('ed25519');
  return { pepper: randomBytes(32), jwtPrivateKey: privateKey, jwtPublicKey: publicKey };
}
