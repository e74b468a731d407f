// Files attached to records (specimen photos, examination reports, WPS documents): the upload request
// and the addresses the API serves them from. Shared by every screen that attaches or shows a file.
import { uploadSchema, type uploadKinds } from '@beadroll/rules';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from './api-client';

export type UploadKind = (typeof uploadKinds)[number];

/** Where a stored file is downloaded (attachment) or shown in the page (inline, images and PDFs). */
export const uploadContentUrl = (id: string, inline = false) =>
  `/api/uploads/${encodeURIComponent(id)}/content${inline ? '?inline=1' : ''}`;

/** POST /api/uploads: the server checks the bytes (images and PDF only, 15 MB) and keeps the file name. */
export function useUploadFile() {
  return useMutation({
    mutationFn: ({ file, kind }: { file: File; kind: UploadKind }) => {
      const body = new FormData();
      body.set('kind', kind);
      body.set('file', file, file.name);
      return apiRequest('/api/uploads', uploadSchema, { method: 'POST', body });
    },
    meta: { inlineErrors: true },
  });
}
