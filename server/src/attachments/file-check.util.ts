import { fileTypeFromBuffer } from 'file-type';
import type { AttachmentSummary } from '@ostium/shared';

export type AcceptedMime = AttachmentSummary['mimeType'];
export const ACCEPTED_MIMES: readonly AcceptedMime[] = ['image/jpeg', 'image/png', 'application/pdf'];
export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024;

export type FileCheck = { ok: true; mime: AcceptedMime; ext: string } | { ok: false; detected: string | null; message: string };

/**
 * Decides by the file's own bytes (magic numbers, via file-type) whether it is a JPEG, PNG or PDF.
 * The name and the declared Content-Type are never consulted: both are whatever the sender says.
 */
export async function checkUploadContent(bytes: Uint8Array): Promise<FileCheck> {
  if (bytes.length === 0) return { ok: false, detected: null, message: 'The file is empty; only JPEG, PNG and PDF files are accepted' };
  const found = await fileTypeFromBuffer(bytes);
  if (found && (ACCEPTED_MIMES as readonly string[]).includes(found.mime)) return { ok: true, mime: found.mime as AcceptedMime, ext: found.ext };
  if (found) {
    return { ok: false, detected: found.mime, message: `The file's content is ${found.mime} (.${found.ext}), not a JPEG, PNG or PDF; only those are accepted` };
  }
  return { ok: false, detected: null, message: 'The file\'s content is not a recognised type (not a JPEG, PNG or PDF); only those are accepted' };
}

/** The attachment kind a file gets when the uploader does not say: images are radiographs, PDFs letters. */
export const defaultKind = (mime: AcceptedMime): AttachmentSummary['kind'] => (mime === 'application/pdf' ? 'letter' : 'radiograph');

/** A display name safe to store and echo: no folders, no control characters, at most 255 characters. */
export function cleanFileName(name: string | undefined): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex
  const cleaned = base.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return (cleaned || 'upload').slice(0, 255);
}

/** RFC 6266 Content-Disposition with an ASCII fallback and the UTF-8 name (RFC 5987 encoding). */
export function contentDisposition(kind: 'inline' | 'attachment', name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
