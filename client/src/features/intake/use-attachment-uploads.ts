import type { AttachmentSummary } from '@ostium/shared';
import { useCallback, useEffect, useRef, useState } from 'react';
import { ApiError } from '../../lib/api-client';
import { uploadAttachment, type AttachmentKind } from '../referrals/api/attachments';

export interface UploadItem {
  key: string;
  file: File;
  kind: AttachmentKind;
  /** 0..1 */
  progress: number;
  state: 'uploading' | 'done' | 'failed';
  error?: string;
  /** A network or server fault may pass on a second try; a refused file will not. */
  retriable?: boolean;
  attachment?: AttachmentSummary;
}

/** PDFs are letters; images are radiographs (the server decides by content either way). */
export const kindOf = (file: File): AttachmentKind => (file.type === 'application/pdf' || /\.pdf$/i.test(file.name) ? 'letter' : 'radiograph');

/**
 * Each file uploads the moment it is dropped, so saving the referral only sends ids; a failed file
 * stays in the list with the reason and touches nothing else of the form.
 */
export function useAttachmentUploads() {
  const [items, setItems] = useState<UploadItem[]>([]);
  const controllers = useRef(new Map<string, AbortController>());
  const seq = useRef(0);

  const patch = useCallback((key: string, p: Partial<UploadItem>) => setItems((list) => list.map((i) => (i.key === key ? { ...i, ...p } : i))), []);

  const start = useCallback(
    (key: string, file: File, kind: AttachmentKind) => {
      const ctrl = new AbortController();
      controllers.current.set(key, ctrl);
      uploadAttachment(file, kind, (f) => patch(key, { progress: f }), ctrl.signal)
        .then((attachment) => patch(key, { state: 'done', progress: 1, attachment, error: undefined }))
        .catch((e: Error) =>
          patch(key, { state: 'failed', error: e.message || 'The upload failed', retriable: !(e instanceof ApiError) || e.status === 0 || e.status >= 500 }),
        )
        .finally(() => controllers.current.delete(key));
    },
    [patch],
  );

  const add = useCallback(
    (files: File[]) => {
      const fresh = files.map((file) => ({ key: `u${++seq.current}`, file, kind: kindOf(file), progress: 0, state: 'uploading' as const }));
      setItems((list) => [...list, ...fresh]);
      for (const f of fresh) start(f.key, f.file, f.kind);
    },
    [start],
  );

  /** Files refused before upload (wrong type, too large): listed with the reason, never sent. */
  const refuse = useCallback((refused: { file: File; reason: string }[]) => {
    setItems((list) => [
      ...list,
      ...refused.map(({ file, reason }) => ({ key: `u${++seq.current}`, file, kind: kindOf(file), progress: 0, state: 'failed' as const, error: reason })),
    ]);
  }, []);

  const retry = useCallback(
    (key: string) => {
      const item = items.find((i) => i.key === key);
      if (!item) return;
      patch(key, { state: 'uploading', progress: 0, error: undefined });
      start(key, item.file, item.kind);
    },
    [items, patch, start],
  );

  const remove = useCallback((key: string) => {
    controllers.current.get(key)?.abort();
    controllers.current.delete(key);
    setItems((list) => list.filter((i) => i.key !== key));
  }, []);

  const reset = useCallback(() => setItems([]), []);

  useEffect(() => {
    const live = controllers.current;
    return () => live.forEach((c) => c.abort());
  }, []);

  return {
    items,
    add,
    refuse,
    retry,
    remove,
    reset,
    attachmentIds: items.flatMap((i) => (i.state === 'done' && i.attachment ? [i.attachment.id] : [])),
    uploading: items.some((i) => i.state === 'uploading'),
  };
}

export type AttachmentUploads = ReturnType<typeof useAttachmentUploads>;
