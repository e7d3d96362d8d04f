import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { AttachmentDto, UploadTicket } from '@shared/jobs/dto';

export const fileKeys = {
  all: ['files'] as const,
  job: (jobId: string) => [...fileKeys.all, 'job', jobId] as const,
  instrumentPhotos: (instrumentId: string) => [...fileKeys.all, 'instrument', instrumentId] as const,
};

// The links inside expire after ten minutes; refresh well before.
const LINK_FRESH_MS = 4 * 60_000;
const missingThumbnail = (list: AttachmentDto[] | undefined) => list?.some((a) => a.kind === 'photo' && !a.thumbnailUrl);
/** While the worker is still making a thumbnail, look again shortly. */
const thumbnailRefetch = (list: AttachmentDto[] | undefined) => (missingThumbnail(list) ? 3000 : LINK_FRESH_MS);

export function jobFilesQueryOptions(jobId: string) {
  return queryOptions({
    queryKey: fileKeys.job(jobId),
    queryFn: ({ signal }) => api.get<{ attachments: AttachmentDto[] }>(`/api/jobs/${jobId}/attachments`, signal),
    select: (data) => data.attachments,
    staleTime: LINK_FRESH_MS,
    refetchInterval: (query) => thumbnailRefetch(query.state.data?.attachments),
  });
}

export function instrumentPhotosQueryOptions(instrumentId: string) {
  return queryOptions({
    queryKey: fileKeys.instrumentPhotos(instrumentId),
    queryFn: ({ signal }) => api.get<{ attachments: AttachmentDto[] }>(`/api/instruments/${instrumentId}/photos`, signal),
    select: (data) => data.attachments,
    staleTime: LINK_FRESH_MS,
    refetchInterval: LINK_FRESH_MS,
  });
}


export const fileApi = {
  begin: (jobId: string, body: object) => api.post<UploadTicket>(`/api/jobs/${jobId}/attachments`, body),
  renew: (attachmentId: string) => api.post<UploadTicket>(`/api/attachments/${attachmentId}/upload-url`),
  confirm: (attachmentId: string) => api.post<{ attachment: AttachmentDto }>(`/api/attachments/${attachmentId}/confirm`),
  download: (attachmentId: string) => api.get<{ url: string; expiresAt: string }>(`/api/attachments/${attachmentId}/download`),
  remove: (attachmentId: string) => api.delete<void>(`/api/attachments/${attachmentId}`),
};
