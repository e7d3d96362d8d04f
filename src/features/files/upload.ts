import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { precheckFile, type PhotoTag } from '@shared/files/limits';
import { isApiError } from '@/lib/api-client';
import { fileApi, fileKeys } from './queries';

/**
 * Uploads from the bench. Each file goes straight to storage with the presigned PUT (XHR, because
 * fetch cannot report upload progress), then the API confirms it. A phone that loses its signal
 * keeps the file in memory: "Retry" asks for a fresh link to the same upload and sends it again,
 * and coming back online retries by itself.
 */

export type UploadState = 'starting' | 'uploading' | 'confirming' | 'done' | 'failed' | 'refused';

export interface UploadItem {
  localId: string;
  file: File;
  kind: 'photo' | 'document';
  tag?: PhotoTag;
  caption?: string;
  state: UploadState;
  /** 0–1 while uploading. */
  progress: number;
  attachmentId?: string;
  message?: string;
}

class StorageError extends Error {
  constructor(readonly status: number) {
    super(status ? `Storage answered ${status}` : 'The connection dropped');
  }
}

export function putWithProgress(url: string, file: Blob, headers: Record<string, string>, onProgress: (fraction: number) => void) {
  return new Promise<void>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('PUT', url);
    for (const [k, v] of Object.entries(headers)) xhr.setRequestHeader(k, v);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => (xhr.status >= 200 && xhr.status < 300 ? resolve() : reject(new StorageError(xhr.status)));
    xhr.onerror = () => reject(new StorageError(0));
    xhr.ontimeout = () => reject(new StorageError(0));
    xhr.send(file);
  });
}

let seq = 0;

export function useUploads(jobId: string) {
  const queryClient = useQueryClient();
  const [items, setItems] = useState<UploadItem[]>([]);
  // the latest list for callbacks that outlive a render (retries, the browser coming back online)
  const itemsRef = useRef(items);
  useEffect(() => {
    itemsRef.current = items;
  }, [items]);

  const patch = useCallback((localId: string, change: Partial<UploadItem>) => {
    setItems((list) => list.map((i) => (i.localId === localId ? { ...i, ...change } : i)));
  }, []);

  const run = useCallback(
    async (item: UploadItem) => {
      let attachmentId = item.attachmentId;
      try {
        patch(item.localId, { state: 'starting', progress: 0, message: undefined });
        const ticket = attachmentId
          ? await fileApi.renew(attachmentId)
          : await fileApi.begin(jobId, {
              kind: item.kind,
              ...(item.kind === 'photo' ? { tag: item.tag } : {}),
              ...(item.caption ? { caption: item.caption } : {}),
              contentType: item.file.type,
              size: item.file.size,
            });
        attachmentId = ticket.attachment.id;
        patch(item.localId, { attachmentId, state: 'uploading' });
        await putWithProgress(ticket.upload.url, item.file, ticket.upload.headers, (progress) => patch(item.localId, { progress }));
        patch(item.localId, { state: 'confirming', progress: 1 });
        await fileApi.confirm(attachmentId);
        patch(item.localId, { state: 'done' });
        await queryClient.invalidateQueries({ queryKey: fileKeys.all });
      } catch (error) {
        if (isApiError(error) && (error.code === 'upload_refused' || error.code === 'invalid_request' || error.status === 403)) {
          // refused for what the file is: sending it again cannot help
          patch(item.localId, { state: 'refused', message: error.message, attachmentId: error.code === 'upload_refused' ? undefined : attachmentId });
          return;
        }
        const message =
          error instanceof StorageError || (isApiError(error) && (error.code === 'network_error' || error.code === 'upload_missing'))
            ? 'The upload did not get through. Check the signal and retry.'
            : isApiError(error)
              ? error.message
              : 'The upload failed. Retry.';
        patch(item.localId, { state: 'failed', message, attachmentId });
      }
    },
    [jobId, patch, queryClient],
  );

  const start = useCallback(
    (file: File, meta: { kind: 'photo' | 'document'; tag?: PhotoTag; caption?: string }) => {
      const problem = precheckFile(meta.kind, file);
      const item: UploadItem = { localId: `u${++seq}`, file, ...meta, state: problem ? 'refused' : 'starting', progress: 0, message: problem ?? undefined };
      setItems((list) => [item, ...list]);
      if (!problem) void run(item);
    },
    [run],
  );

  const retry = useCallback(
    (localId: string) => {
      const item = itemsRef.current.find((i) => i.localId === localId);
      if (item && item.state === 'failed') void run(item);
    },
    [run],
  );

  const dismiss = useCallback((localId: string) => setItems((list) => list.filter((i) => i.localId !== localId)), []);

  useEffect(() => {
    const onOnline = () => itemsRef.current.filter((i) => i.state === 'failed').forEach((i) => void run(i));
    window.addEventListener('online', onOnline);
    return () => window.removeEventListener('online', onOnline);
  }, [run]);

  // finished uploads leave the queue after a moment; the gallery shows them
  useEffect(() => {
    if (!items.some((i) => i.state === 'done')) return;
    const timer = setTimeout(() => setItems((list) => list.filter((i) => i.state !== 'done')), 2500);
    return () => clearTimeout(timer);
  }, [items]);

  return { items, start, retry, dismiss };
}
