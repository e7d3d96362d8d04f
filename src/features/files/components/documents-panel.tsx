import { useId, useState, type ChangeEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Button, buttonClasses } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { assignLocation } from '@/lib/browser';
import { fileApi, fileKeys, jobFilesQueryOptions } from '../queries';
import { useUploads } from '../upload';
import { UploadQueue } from './upload-queue';

const DOCUMENT_KINDS = ['Estimate', 'School purchase order', 'Condition report', 'Other'];

/** PDFs of a job; downloads go through a link that expires within a minute. */
export function DocumentsPanel({ jobId, canAdd }: { jobId: string; canAdd: boolean }) {
  const queryClient = useQueryClient();
  const files = useQuery(jobFilesQueryOptions(jobId));
  const uploads = useUploads(jobId);
  const [kind, setKind] = useState(DOCUMENT_KINDS[0]);
  const inputId = useId();
  const download = useMutation({
    mutationFn: (id: string) => fileApi.download(id),
    onSuccess: ({ url }) => assignLocation(url),
  });
  const remove = useMutation({
    mutationFn: (id: string) => fileApi.remove(id),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: fileKeys.job(jobId) }),
  });
  const documents = (files.data ?? []).filter((a) => a.kind === 'document');

  const onFile = (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    if (file) uploads.start(file, { kind: 'document', caption: kind });
    event.target.value = '';
  };

  return (
    <div className="flex flex-col gap-4">
      {files.isPending ? (
        <Spinner label="Loading documents…" showLabel />
      ) : files.isError ? (
        <ErrorState title="Documents could not be loaded" error={files.error} onRetry={() => void files.refetch()} />
      ) : documents.length ? (
        <ul aria-label="Documents" className="divide-y divide-paper-200 rounded-xl border border-paper-200">
          {documents.map((d) => (
            <li key={d.id} className="flex flex-wrap items-center justify-between gap-2 p-3">
              <span>
                <span className="font-semibold text-ink-950">{d.caption ?? 'Document'}</span>
                <span className="text-sm text-ink-600">
                  {' '}
                  · PDF, {(d.sizeBytes / 1024).toFixed(0)} KB{d.uploadedBy ? ` · ${d.uploadedBy.name}` : ''}
                </span>
              </span>
              <span className="flex gap-2">
                <Button variant="secondary" onClick={() => download.mutate(d.id)} disabled={download.isPending}>
                  Download<span className="sr-only"> {d.caption}</span>
                </Button>
                {d.canDelete ? (
                  <Button
                    variant="quiet"
                    onClick={() => window.confirm('Remove this document? It is deleted from storage.') && remove.mutate(d.id)}
                  >
                    Remove<span className="sr-only"> {d.caption}</span>
                  </Button>
                ) : null}
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-ink-600">No documents yet.</p>
      )}
      <FormError message={download.error || remove.error ? (isApiError(download.error ?? remove.error) ? (download.error ?? remove.error)!.message : 'That did not work. Try again.') : null} />
      {canAdd ? (
        <div className="flex flex-col gap-3 sm:flex-row sm:items-end">
          <Field label="Document" className="sm:w-64">
            <select className={controlClasses} value={kind} onChange={(e) => setKind(e.target.value)}>
              {DOCUMENT_KINDS.map((k) => (
                <option key={k}>{k}</option>
              ))}
            </select>
          </Field>
          <label htmlFor={inputId} className={buttonClasses('secondary', 'lg', 'cursor-pointer')}>
            Add a PDF
          </label>
          <input id={inputId} type="file" accept="application/pdf" className="sr-only" onChange={onFile} />
        </div>
      ) : null}
      <UploadQueue items={uploads.items} onRetry={uploads.retry} onDismiss={uploads.dismiss} />
      <p className="text-xs text-ink-600">PDF up to 25 MB: estimates, school purchase orders, condition reports.</p>
    </div>
  );
}
