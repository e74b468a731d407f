// Files attached to the record (WPS documents, specimen photos, examination reports): checked by their
// bytes (file-type), stored in the object store under a random key, described by a row. Nothing is left
// behind when a file is refused or the row cannot be written.
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { Readable } from 'node:stream';
import { fileTypeFromBuffer } from 'file-type';
import type { EntityManager } from 'typeorm';
import { uploadKinds, type Upload } from '@beadroll/rules';
import { z } from 'zod';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { clipText } from '../lib/text.js';
import { readHead, storeDown, streamToStore } from '../lib/stream-to-store.js';
import { imageCutter, PdfScanner } from './content-checks.js';
import * as repo from './uploads.repository.js';

export const MAX_UPLOAD_BYTES = 15 * 1024 * 1024;

export const ALLOWED_TYPES = new Set([
  'image/jpeg',
  'image/png',
  'image/webp',
  'image/heic',
  'image/heif',
  'image/heic-sequence',
  'image/heif-sequence',
  'application/pdf',
]);

const kindSchema = z.enum(uploadKinds, { error: `Kind must be one of ${uploadKinds.join(', ')}` });

/** A file as it arrives in a multipart request: its bytes as a stream, the name the user gave it. */
export interface IncomingFile {
  stream: Readable;
  originalname: string;
}

/** A file stored in the object store by `storeFile`, not yet described by a row. */
export interface StoredFile {
  storageKey: string;
  fileName: string;
  contentType: string;
  size: number;
  sha256: string;
}

// Control characters, direction overrides and isolates (which can make "gpj.exe" read as "exe.jpg"), and
// halves of surrogate pairs: none of them belongs in a file name.
// eslint-disable-next-line no-control-regex
const UNWANTED_IN_NAME = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;
export const MAX_FILE_NAME = 255;

/**
 * The name as the user gave it, without any folder part, control or direction-override characters, at
 * most 255 UTF-16 units (the column's limit), cut between characters, never inside a surrogate pair.
 */
export function cleanFileName(name: string): string {
  const base = path.posix.basename(name.replace(/\\/g, '/'));
  return clipText(base.replace(UNWANTED_IN_NAME, '').trim() || 'file', MAX_FILE_NAME);
}

const notAllowed = (what: string) =>
  AppError.validation(
    { file: `Only JPEG, PNG, WebP, HEIC images and PDF files can be attached; this file is ${what}` },
    'This file cannot be attached',
  );
const tooLarge = () => new AppError('payload_too_large', 'The file is larger than 15 MB; attach a smaller one');

/** Enough of the start of a file for its type to be recognised (file-type reads at most this much). */
const HEAD_BYTES = 4100;

/**
 * Streams an arriving file to the object store, checked as it goes: its type is recognised from its first
 * bytes (anything else is refused before a byte is stored), an image is cut after its end, a PDF is
 * searched for active content, and the size cap is enforced by the parser while the bytes flow. Only a
 * file that passes every check and arrives whole is stored; on any failure — a refusal, an oversize or
 * interrupted upload, the store not answering — nothing is left in the store. At most one 5 MB part is
 * held in memory.
 */
export async function storeFile(
  deps: AppDeps,
  actor: Actor,
  file: IncomingFile,
  maxBytes = MAX_UPLOAD_BYTES,
): Promise<StoredFile> {
  const { stream } = file;
  const arriving = await readHead(stream, HEAD_BYTES);
  const { head } = arriving;
  const detected = head.length ? await fileTypeFromBuffer(head) : undefined;
  if (!detected || !ALLOWED_TYPES.has(detected.mime)) {
    stream.resume();
    throw notAllowed(detected ? detected.mime : head.length ? 'not recognised' : 'empty');
  }
  const contentType = detected.mime.replace(/-sequence$/, '');
  const cutter = imageCutter(contentType);
  const pdf = contentType === 'application/pdf' ? new PdfScanner() : null;
  const storageKey = `uploads/${actor.organizationId}/${randomUUID()}`;
  const { size, sha256 } = await streamToStore(deps, {
    stream,
    file: arriving,
    key: storageKey,
    contentType,
    maxBytes,
    tooLarge,
    async filter(chunk) {
      if (pdf) await pdf.push(chunk);
      return cutter ? cutter.keep(chunk) : chunk;
    },
    async beforeEnd() {
      const active = pdf ? await pdf.end() : null;
      if (active)
        throw AppError.validation(
          { file: `This PDF acts when opened (${active}); attach a plain PDF, for example printed to PDF again` },
          'This file cannot be attached',
        );
    },
  });
  return {
    storageKey,
    fileName: cleanFileName(file.originalname),
    contentType,
    size,
    sha256,
  };
}

/** Describes a stored file by a row and an audit event; the object is deleted if that cannot be done. */
export async function createUpload(
  deps: AppDeps,
  actor: Actor,
  stored: StoredFile | undefined,
  kindValue: unknown,
): Promise<Upload> {
  try {
    const kind = kindSchema.safeParse(kindValue ?? 'other');
    if (!stored) throw AppError.validation({ file: 'Choose a file to attach' });
    if (!kind.success) throw AppError.validation({ kind: kind.error.issues[0]?.message ?? 'Not a kind' });
    const { storageKey, fileName, contentType, size, sha256 } = stored;
    return await deps.dataSource.transaction(async (db) => {
      const now = deps.clock.now();
      const row = {
        organizationId: actor.organizationId,
        storageKey,
        fileName,
        contentType,
        size,
        sha256,
        kind: kind.data,
        uploadedBy: actor.id,
        createdAt: now,
      };
      const id = await repo.insertUpload(db, row);
      await recordAudit(db, actor, now, {
        action: 'upload.created',
        entityType: 'upload',
        entityId: id,
        before: null,
        after: { fileName, contentType, size, sha256, kind: row.kind },
      });
      return repo.toUpload({ ...row, id });
    });
  } catch (err) {
    if (stored)
      await deps.storage.delete(stored.storageKey).catch((cleanup: unknown) => {
        deps.logger.error({ err: cleanup, storageKey: stored.storageKey }, 'could not delete an orphaned upload object');
      });
    throw err;
  }
}

async function findOrThrow(deps: AppDeps, actor: Actor, id: string) {
  const row = isUuid(id) ? await repo.findUpload(deps.dataSource.manager, actor, id) : null;
  if (!row) throw AppError.notFound('upload');
  return row;
}

export async function getUpload(deps: AppDeps, actor: Actor, id: string): Promise<Upload> {
  return repo.toUpload(await findOrThrow(deps, actor, id));
}

export async function uploadContent(
  deps: AppDeps,
  actor: Actor,
  id: string,
): Promise<{ upload: Upload; body: Buffer }> {
  const row = await findOrThrow(deps, actor, id);
  const { body } = await deps.storage.get(row.storageKey).catch((err: unknown) => {
    deps.logger.error({ err, storageKey: row.storageKey }, 'could not read an upload');
    throw storeDown();
  });
  return { upload: repo.toUpload(row), body };
}

/**
 * Checks that every named upload id is the company's, inside the caller's transaction, and attaches the
 * pending ones to the record being saved (so the sweep never takes them); a foreign, unknown or already
 * swept one is a 400 on its field. Returns the uploads by id.
 */
export async function checkAttachments(
  db: EntityManager,
  actor: Actor,
  refs: Array<{ field: string; id: string }>,
  now: Date = new Date(),
): Promise<Map<string, Upload>> {
  const ids = [...new Set(refs.map((r) => r.id))].filter(isUuid);
  // First the attach (it waits for a sweep holding the row, then finds the row gone), then the read.
  await repo.attachUploads(db, actor.organizationId, ids, now);
  const found = await repo.uploadsOfOrganization(db, actor.organizationId, ids);
  const fields: Record<string, string> = {};
  for (const r of refs) if (!found.has(r.id)) fields[r.field] = 'No such upload in your company';
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);
  return found;
}

/** How long a file uploaded from a form waits for its record to be saved before the sweep removes it. */
export const PENDING_UPLOAD_TTL_MS = 24 * 3600 * 1000;

/**
 * Removes the files uploaded from forms that were never saved: pending (never attached) for longer than
 * `ttlMs`. Rows and their audit lines go in one transaction (a batch at a time, skipping rows a save holds),
 * then the objects are deleted from the store. Returns how many were removed.
 */
export async function sweepPendingUploads(
  deps: AppDeps,
  ttlMs = PENDING_UPLOAD_TTL_MS,
): Promise<number> {
  let removed = 0;
  for (;;) {
    const now = deps.clock.now();
    const gone = await deps.dataSource.transaction(async (db) => {
      const rows = await repo.deletePendingUploads(db, new Date(now.getTime() - ttlMs), 200);
      for (const r of rows)
        await db.query(
          `INSERT INTO audit_events (organization_id, actor_id, at, action, entity_type, entity_id, before, after)
           VALUES ($1, NULL, $2, 'upload.discarded', 'upload', $3, $4, NULL)`,
          [
            r.organizationId,
            now,
            r.id,
            JSON.stringify({ fileName: r.fileName, kind: r.kind, reason: 'never attached to a saved record' }),
          ],
        );
      return rows;
    });
    for (const r of gone)
      await deps.storage.delete(r.storageKey).catch((err: unknown) => {
        deps.logger.error({ err, storageKey: r.storageKey }, 'could not delete a swept upload object');
      });
    removed += gone.length;
    if (gone.length < 200) return removed;
  }
}

export const uploadsById = (db: EntityManager, organizationId: string, ids: string[]) =>
  repo.uploadsOfOrganization(db, organizationId, ids);

/** A file the server itself attaches (the demo seed): the same checks and store as an upload. */
export async function uploadBuffer(
  deps: AppDeps,
  actor: Actor,
  file: { buffer: Buffer; originalname: string },
  kind: unknown,
): Promise<Upload> {
  const stored = await storeFile(deps, actor, { stream: Readable.from([file.buffer]), originalname: file.originalname });
  return createUpload(deps, actor, stored, kind);
}
