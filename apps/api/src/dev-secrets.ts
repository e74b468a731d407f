// Secrets of a development or test data folder (issue 11, finding 5): random, made once per folder on
// first use, kept in DATA_DIR/dev-secrets.json readable by its owner only. The session-signing secret
// and the local object store's key pair come from here, so no two folders — and no attacker reading
// this repository — share them. Production never uses this file: it must be given real secrets.
import { randomBytes } from 'node:crypto';
import { linkSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export interface DevSecrets {
  jwtSecret: string;
  s3AccessKeyId: string;
  s3SecretAccessKey: string;
}

export const DEV_SECRETS_FILE = 'dev-secrets.json';

function read(file: string): DevSecrets {
  const parsed = JSON.parse(readFileSync(file, 'utf8')) as Partial<DevSecrets>;
  if (
    typeof parsed.jwtSecret !== 'string' ||
    typeof parsed.s3AccessKeyId !== 'string' ||
    typeof parsed.s3SecretAccessKey !== 'string'
  )
    throw new Error(`${file} is not a Beadroll secrets file; remove it to have a new one made`);
  return parsed as DevSecrets;
}

/** The folder's secrets, made now if the folder has none (safe when two processes start at once). */
export function devSecrets(dataDir: string): DevSecrets {
  const file = path.join(dataDir, DEV_SECRETS_FILE);
  try {
    return read(file);
  } catch (err) {
    if ((err as { code?: string }).code !== 'ENOENT') throw err;
  }
  mkdirSync(dataDir, { recursive: true });
  const fresh: DevSecrets = {
    jwtSecret: randomBytes(48).toString('base64url'),
    s3AccessKeyId: `BRDEV${randomBytes(8).toString('hex').toUpperCase()}`,
    s3SecretAccessKey: randomBytes(30).toString('base64url'),
  };
  // Written whole under another name, then linked into place: the link fails if another process won.
  const tmp = `${file}.${process.pid}.${randomBytes(4).toString('hex')}`;
  writeFileSync(tmp, JSON.stringify(fresh, null, 2), { mode: 0o600 });
  try {
    linkSync(tmp, file);
    return fresh;
  } catch (err) {
    if ((err as { code?: string }).code !== 'EEXIST') throw err;
    return read(file);
  } finally {
    rmSync(tmp, { force: true });
  }
}
