// The development and test mail catcher: an SMTP server on 127.0.0.1 that stores every message it
// receives as an .eml file under $DATA_DIR/mail/. The API sends to it through nodemailer exactly as it
// would to a hosted relay; only the SMTP settings differ.
import { SMTPServer } from 'smtp-server';
import { mkdir, writeFile } from 'node:fs/promises';
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

export interface MailCatcher {
  port: number;
  dir: string;
  close(): Promise<void>;
}

export async function startMailCatcher(opts: { port: number; dir: string; host?: string }): Promise<MailCatcher> {
  await mkdir(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    // smtp-server's bundled STARTTLS certificate has expired; loopback only, so plain SMTP.
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        // Time first so that a directory listing sorts in arrival order.
        const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomUUID().slice(0, 8)}.eml`;
        writeFile(path.join(opts.dir, name), Buffer.concat(chunks)).then(
          () => callback(),
          (err: Error) => callback(err),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
  });
  return {
    port: opts.port,
    dir: opts.dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.SMTP_PORT ?? 2525);
  const dir = path.join(process.env.DATA_DIR ?? '.data', 'mail');
  const catcher = await startMailCatcher({ port, dir });
  console.log(`beadroll: mail catcher on 127.0.0.1:${port}, messages in ${dir}`);
  const stop = () => void catcher.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
