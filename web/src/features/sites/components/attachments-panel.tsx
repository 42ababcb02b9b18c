import { useEffect, useRef, useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { InlineError, Loading } from '../../../components/feedback.tsx';
import { TextField, inputClass } from '../../../components/field.tsx';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import type { Attachment } from '../../../types/api.ts';
import { useAttachmentContent } from '../api/get-attachment-content.ts';
import { useAttachments } from '../api/get-attachments.ts';
import { useUploadAttachment } from '../api/upload-attachment.ts';

function mimeOf(a: Attachment): string {
  return a.mediaType ?? '';
}

function nameOf(a: Attachment): string {
  return a.filename ?? a.originalName ?? `attachment-${a.id}`;
}

/** A data: URL, since the server's content policy allows `img-src 'self' data:` and not blob:. */
function useDataUrl(blob: Blob | undefined): string | null {
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!blob) return;
    let live = true;
    const reader = new FileReader();
    reader.onload = () => {
      if (live && typeof reader.result === 'string') setUrl(reader.result);
    };
    reader.readAsDataURL(blob);
    return () => {
      live = false;
      reader.abort();
    };
  }, [blob]);
  return url;
}

function Thumbnail({ attachment }: { attachment: Attachment }) {
  const isImage = mimeOf(attachment).startsWith('image/');
  const content = useAttachmentContent(attachment.id, isImage);
  const url = useDataUrl(content.data);
  if (!isImage) {
    return (
      <div className="grid aspect-[4/3] w-full place-items-center rounded-md bg-ink-100 text-caption font-semibold uppercase text-ink-600" aria-hidden="true">
        {(nameOf(attachment).split('.').pop() ?? 'file').slice(0, 4)}
      </div>
    );
  }
  if (!url) return <div className="aspect-[4/3] w-full animate-pulse rounded-md bg-ink-100" aria-hidden="true" />;
  return <img src={url} alt={attachment.caption ? `Photo: ${attachment.caption}` : `Photo ${nameOf(attachment)}`} className="aspect-[4/3] w-full rounded-md object-cover" />;
}

function DownloadButton({ attachment }: { attachment: Attachment }) {
  const content = useAttachmentContent(attachment.id, false);
  const [error, setError] = useState<unknown>(null);
  return (
    <>
      <Button
        variant="quiet"
        className="text-caption"
        aria-label={`Download ${nameOf(attachment)}`}
        onClick={async () => {
          setError(null);
          const result = content.data ? { data: content.data } : await content.refetch();
          if (!result.data) {
            setError(content.error ?? new Error('The file could not be downloaded.'));
            return;
          }
          const url = URL.createObjectURL(result.data);
          const link = document.createElement('a');
          link.href = url;
          link.download = nameOf(attachment);
          link.click();
          setTimeout(() => URL.revokeObjectURL(url), 10_000);
        }}
      >
        Download
      </Button>
      {error ? <InlineError error={error} /> : null}
    </>
  );
}

function UploadForm({ siteId }: { siteId: string }) {
  const upload = useUploadAttachment();
  const fileRef = useRef<HTMLInputElement>(null);
  const [caption, setCaption] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    setDone(null);
    const file = fileRef.current?.files?.[0];
    if (!file) {
      setProblem('Choose a file to upload.');
      return;
    }
    if (!caption.trim()) {
      setProblem('Write a caption, for example "CT on L2, arrow toward load".');
      return;
    }
    setProblem(null);
    upload.mutate({ siteId, file, caption: caption.trim() }, {
      onSuccess: () => {
        setDone(`Uploaded ${file.name}.`);
        setCaption('');
        if (fileRef.current) fileRef.current.value = '';
      },
    });
  };

  return (
    <form onSubmit={submit} className="mt-4 grid gap-3 rounded-md border border-dashed border-ink-300 p-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end" aria-label="Upload an attachment">
      <div className="flex flex-col gap-1">
        <label htmlFor="attachment-file" className="text-caption font-medium text-ink-800">File</label>
        <input id="attachment-file" ref={fileRef} name="file" type="file" accept="image/jpeg,image/png,application/pdf" className={`${inputClass} py-1.5`} />
      </div>
      <TextField label="Caption" hint="JPEG, PNG or PDF." name="caption" value={caption} onChange={(e) => setCaption(e.target.value)} maxLength={200} />
      <Button type="submit" disabled={upload.isPending}>{upload.isPending ? 'Uploading…' : 'Upload'}</Button>
      <div className="sm:col-span-3" aria-live="polite">
        {problem && <p className="text-caption font-medium text-sev-error" role="alert">{problem}</p>}
        {upload.isError && <InlineError error={upload.error} title="Upload refused:" />}
        {done && <p className="text-caption text-weir-800">{done}</p>}
      </div>
    </form>
  );
}

export function AttachmentsPanel({ siteId, canUpload }: { siteId: string; canUpload: boolean }) {
  const attachments = useAttachments(siteId);
  return (
    <div>
      {attachments.isPending && <Loading label="Loading attachments…" />}
      {attachments.isError && <InlineError error={attachments.error} title="Attachments could not be loaded." />}
      {attachments.data && attachments.data.items.length === 0 && <p className="text-body text-ink-600">No photos or test evidence yet.</p>}
      {attachments.data && attachments.data.items.length > 0 && (
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4">
          {attachments.data.items.map((a) => (
            <li key={a.id} className="flex flex-col gap-1.5 rounded-md border border-ink-200 p-2">
              <Thumbnail attachment={a} />
              <p className="text-body font-medium text-ink-900 break-words">{a.caption || <span className="text-ink-500">No caption</span>}</p>
              <p className="text-caption text-ink-600 break-all">{nameOf(a)} {a.size !== undefined && `· ${formatBytes(a.size)}`}</p>
              <p className="text-caption text-ink-600">{a.uploadedBy?.name ?? ''}{a.createdAt ? ` · ${formatDateTime(a.createdAt)}` : ''}</p>
              <div><DownloadButton attachment={a} /></div>
            </li>
          ))}
        </ul>
      )}
      {canUpload && <UploadForm siteId={siteId} />}
    </div>
  );
}
