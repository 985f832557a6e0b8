import type { AttachmentSummary } from '@ostium/shared';
import { useEffect, useState } from 'react';
import { api, apiBlob, openBlobInNewTab } from '../../../lib/api-client';

export type AttachmentKind = AttachmentSummary['kind'];

/** POST /api/attachments (multipart field `file`); the server checks the content, not the name. */
export function uploadAttachment(file: File, kind: AttachmentKind, onProgress: (fraction: number) => void, signal?: AbortSignal) {
  const body = new FormData();
  body.append('kind', kind);
  body.append('file', file, file.name);
  return api<AttachmentSummary>('/attachments', { method: 'POST', body, onUploadProgress: onProgress, signal });
}

export const attachmentContentPath = (id: number) => `/attachments/${id}/content`;

/** An object URL for a protected attachment (the token rides in the header, so <img src> cannot fetch it). */
export function useAttachmentUrl(id: number, enabled = true) {
  const [state, setState] = useState<{ url: string | null; error: string | null }>({ url: null, error: null });
  useEffect(() => {
    if (!enabled) return;
    let url: string | null = null;
    let live = true;
    apiBlob(attachmentContentPath(id))
      .then((blob) => {
        if (!live) return;
        url = URL.createObjectURL(blob);
        setState({ url, error: null });
      })
      .catch((e: Error) => live && setState({ url: null, error: e.message }));
    return () => {
      live = false;
      if (url) URL.revokeObjectURL(url);
    };
  }, [id, enabled]);
  return state;
}

/** Opens an attachment in a new tab. */
export const openAttachment = (id: number): Promise<void> => openBlobInNewTab(attachmentContentPath(id));
