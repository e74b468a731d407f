// Files attached to the record (WPS documents, specimen photos, examination reports): checked by their
// bytes (file-type), stored in the object store under a random key, described by a row. Nothing is left
// behind when a file is refused or the row cannot be written.
import { createHash, randomUUID } from 'node:crypto';
import path from 'node:path';
import { fileTypeFromBuffer } from 'file-type';
import type { EntityManager } from 'typeorm';
import { uploadKinds, type Upload } from '@beadroll/rules';
import { z } from 'zod';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { clipText } from '../lib/text.js';
import { activePdfContent, jpegWithoutTrailer, pngWithoutTrailer } from './content-checks.js';
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

export interface IncomingFile {
  buffer: Buffer;
  originalname: string;
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

export async function createUpload(
  deps: AppDeps,
  actor: Actor,
  file: IncomingFile | undefined,
  kindValue: unknown,
): Promise<Upload> {
  const kind = kindSchema.safeParse(kindValue ?? 'other');
  if (!file) throw AppError.validation({ file: 'Choose a file to attach' });
  if (!kind.success) throw AppError.validation({ kind: kind.error.issues[0]?.message ?? 'Not a kind' });
  const detected = await fileTypeFromBuffer(file.buffer);
  if (!detected || !ALLOWED_TYPES.has(detected.mime))
    throw AppError.validation(
      {
        file: `Only JPEG, PNG, WebP, HEIC images and PDF files can be attached; this file is ${detected ? detected.mime : 'not recognised'}`,
      },
      'This file cannot be attached',
    );
  const contentType = detected.mime.replace(/-sequence$/, '');
  const body = keepOnlyContent(contentType, file.buffer);
  const storageKey = `uploads/${actor.organizationId}/${randomUUID()}`;
  const fileName = cleanFileName(file.originalname);
  await deps.storage.put(storageKey, body, contentType);
  try {
    return await deps.dataSource.transaction(async (db) => {
      const now = deps.clock.now();
      const row = {
        organizationId: actor.organizationId,
        storageKey,
        fileName,
        contentType,
        size: body.byteLength,
        sha256: createHash('sha256').update(body).digest('hex'),
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
        after: { fileName, contentType, size: row.size, sha256: row.sha256, kind: row.kind },
      });
      return repo.toUpload({ ...row, id });
    });
  } catch (err) {
    await deps.storage.delete(storageKey).catch((cleanup: unknown) => {
      deps.logger.error({ err: cleanup, storageKey }, 'could not delete an orphaned upload object');
    });
    throw err;
  }
}

/** The bytes to keep: an active PDF is refused; an image loses anything after its end marker. */
function keepOnlyContent(contentType: string, bytes: Buffer): Buffer {
  if (contentType === 'application/pdf') {
    const active = activePdfContent(bytes);
    if (active)
      throw AppError.validation(
        { file: `This PDF acts when opened (${active}); attach a plain PDF, for example printed to PDF again` },
        'This file cannot be attached',
      );
    return bytes;
  }
  if (contentType === 'image/png') return pngWithoutTrailer(bytes);
  if (contentType === 'image/jpeg') return jpegWithoutTrailer(bytes);
  return bytes;
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
  const { body } = await deps.storage.get(row.storageKey);
  return { upload: repo.toUpload(row), body };
}

/**
 * Checks that every named upload id is the company's, inside the caller's transaction; a foreign or
 * unknown one is a 400 on its field. Returns the uploads by id.
 */
export async function checkAttachments(
  db: EntityManager,
  actor: Actor,
  refs: Array<{ field: string; id: string }>,
): Promise<Map<string, Upload>> {
  const found = await repo.uploadsOfOrganization(
    db,
    actor.organizationId,
    [...new Set(refs.map((r) => r.id))].filter(isUuid),
  );
  const fields: Record<string, string> = {};
  for (const r of refs) if (!found.has(r.id)) fields[r.field] = 'No such upload in your company';
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);
  return found;
}

export const uploadsById = (db: EntityManager, organizationId: string, ids: string[]) =>
  repo.uploadsOfOrganization(db, organizationId, ids);
