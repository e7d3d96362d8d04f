import { useId, useRef, useState, type ChangeEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { PHOTO_TAG_LABELS, PHOTO_TAGS, type PhotoTag } from '@shared/files/limits';
import type { AttachmentDto } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { controlClasses, FormError } from '@/components/ui/form-controls';
import { Spinner } from '@/components/ui/spinner';
import { buttonClasses } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { fileApi, fileKeys, jobFilesQueryOptions } from '../queries';
import { useUploads } from '../upload';
import { BeforeAfter } from './before-after';
import { UploadQueue } from './upload-queue';

/**
 * Photos of one job, taken at the bench: pick the tag, tap the camera button (the phone opens its
 * camera), and the picture uploads with a progress bar. Big targets, one column, one thumb.
 */
export function PhotosPanel({ jobId, canAdd }: { jobId: string; canAdd: boolean }) {
  const files = useQuery(jobFilesQueryOptions(jobId));
  const uploads = useUploads(jobId);
  const photos = (files.data ?? []).filter((a) => a.kind === 'photo');
  const suggested: PhotoTag = photos.some((p) => p.tag === 'before') ? 'after' : 'before';
  const [chosenTag, setChosenTag] = useState<PhotoTag>();
  const tag = chosenTag ?? suggested;
  const [caption, setCaption] = useState('');
  const cameraId = useId();
  const libraryId = useId();
  const captionId = useId();
  const cameraRef = useRef<HTMLInputElement>(null);

  const onFiles = (event: ChangeEvent<HTMLInputElement>) => {
    for (const file of Array.from(event.target.files ?? [])) uploads.start(file, { kind: 'photo', tag, caption: caption.trim() || undefined });
    event.target.value = ''; // the same picture can be picked again after a refusal
    setCaption('');
    setChosenTag(undefined);
  };

  return (
    <div className="flex flex-col gap-5">
      {canAdd ? (
        <div className="flex flex-col gap-3">
          <fieldset>
            <legend className="mb-2 text-sm font-semibold text-ink-800">Photo of</legend>
            <div className="grid grid-cols-3 gap-2">
              {PHOTO_TAGS.map((t) => (
                <label
                  key={t}
                  className="flex min-h-12 cursor-pointer items-center justify-center rounded-lg border border-paper-300 bg-white font-semibold text-ink-800 has-[:checked]:border-accent-600 has-[:checked]:bg-accent-600 has-[:checked]:text-white has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-accent-600"
                >
                  <input type="radio" name={`tag-${cameraId}`} value={t} checked={tag === t} onChange={() => setChosenTag(t)} className="sr-only" />
                  {PHOTO_TAG_LABELS[t]}
                </label>
              ))}
            </div>
          </fieldset>
          <label htmlFor={captionId} className="sr-only">
            Caption
          </label>
          <input id={captionId} className={controlClasses} placeholder="Caption (optional), e.g. low B pad torn" value={caption} onChange={(e) => setCaption(e.target.value)} maxLength={300} />
          <div className="grid grid-cols-[2fr_1fr] gap-2">
            <label htmlFor={cameraId} className={buttonClasses('primary', 'lg', 'cursor-pointer')}>
              <svg className="size-5" viewBox="0 0 20 20" fill="none" aria-hidden="true">
                <path d="M3 6.5h3l1.5-2h5L14 6.5h3v9H3z" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
                <circle cx="10" cy="11" r="3" stroke="currentColor" strokeWidth="1.6" />
              </svg>
              Take {PHOTO_TAG_LABELS[tag].toLowerCase()} photo
            </label>
            <input ref={cameraRef} id={cameraId} type="file" accept="image/*" capture="environment" className="sr-only" onChange={onFiles} />
            <label htmlFor={libraryId} className={buttonClasses('secondary', 'lg', 'cursor-pointer')}>
              From library
            </label>
            <input id={libraryId} type="file" accept="image/jpeg,image/png,image/webp" multiple className="sr-only" onChange={onFiles} />
          </div>
          <p className="text-xs text-ink-600">JPEG, PNG or WebP up to 15 MB. Location data is removed before the photo is stored.</p>
          <UploadQueue items={uploads.items} onRetry={uploads.retry} onDismiss={uploads.dismiss} />
        </div>
      ) : null}

      {files.isPending ? (
        <Spinner label="Loading photos…" showLabel />
      ) : files.isError ? (
        <ErrorState title="Photos could not be loaded" error={files.error} onRetry={() => void files.refetch()} />
      ) : (
        <>
          <BeforeAfter photos={photos} />
          <PhotoGallery jobId={jobId} photos={photos} />
        </>
      )}
    </div>
  );
}

function PhotoGallery({ jobId, photos }: { jobId: string; photos: AttachmentDto[] }) {
  const queryClient = useQueryClient();
  const remove = useMutation({
    mutationFn: (id: string) => fileApi.remove(id),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: fileKeys.job(jobId) }),
  });
  if (!photos.length) return <p className="text-ink-600">No photos yet.</p>;
  return (
    <div className="flex flex-col gap-2">
      <ul aria-label="Photos" className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4">
        {photos.map((p) => (
          <li key={p.id} className="flex flex-col gap-1">
            <a href={p.url ?? undefined} target="_blank" rel="noreferrer" className="block overflow-hidden rounded-lg bg-paper-200">
              <img
                src={p.thumbnailUrl ?? p.url ?? undefined}
                alt={`${PHOTO_TAG_LABELS[p.tag ?? 'detail']} photo${p.caption ? `: ${p.caption}` : ''}`}
                className="aspect-square w-full object-cover"
                loading="lazy"
              />
            </a>
            <span className={cn('text-xs font-semibold', p.tag === 'before' ? 'text-ink-800' : 'text-accent-800')}>
              {PHOTO_TAG_LABELS[p.tag ?? 'detail']}
            </span>
            {p.caption ? <span className="text-xs text-ink-600">{p.caption}</span> : null}
            {p.canDelete ? (
              <Button
                variant="quiet"
                className="self-start"
                disabled={remove.isPending}
                onClick={() => {
                  if (window.confirm('Remove this photo? It is deleted from storage.')) remove.mutate(p.id);
                }}
              >
                Remove<span className="sr-only"> {PHOTO_TAG_LABELS[p.tag ?? 'detail'].toLowerCase()} photo</span>
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
      <FormError message={remove.error ? (isApiError(remove.error) ? remove.error.message : 'Not removed. Try again.') : null} />
    </div>
  );
}
