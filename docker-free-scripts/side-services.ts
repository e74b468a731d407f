// Runs the mail catcher and the object store together in one process until it is told to stop.
import path from 'node:path';
import { startMailCatcher } from './mail-catcher.js';
import { startObjectStore, storeCredentials } from './object-store.js';

const dataDir = process.env.DATA_DIR ?? '.data';
const mail = await startMailCatcher({ port: Number(process.env.SMTP_PORT ?? 2525), dir: path.join(dataDir, 'mail') });
const store = await startObjectStore({
  port: Number(process.env.S3_PORT ?? 4569),
  dir: path.join(dataDir, 's3'),
  bucket: process.env.S3_BUCKET ?? 'beadroll',
  credentials: storeCredentials(dataDir),
});
console.log(`beadroll: mail catcher on 127.0.0.1:${mail.port}, object store on 127.0.0.1:${store.port}: ready`);
const stop = () => void Promise.all([mail.close(), store.close()]).then(() => process.exit(0));
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
