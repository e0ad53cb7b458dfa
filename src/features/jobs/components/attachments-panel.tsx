import { useQuery } from '@tanstack/react-query';
import { useRef, useState } from 'react';
import { Button } from '../../../components/ui/button';
import { FormField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import {
  ATTACHMENT_CONTENT_TYPES,
  ATTACHMENT_MAX_BYTES,
  type Attachment,
} from '../../../../shared/api/attachments';
import { errorText } from '../../../lib/error-text';
import { formatDecimal } from '../../../lib/format';
import { jobQueries } from '../api/queries';
import { useUploadAttachment } from '../api/mutations';

const MAX_MB = ATTACHMENT_MAX_BYTES / (1024 * 1024);

function size(bytes: number): string {
  return bytes < 1024 * 1024
    ? `${formatDecimal(bytes / 1024, 0)} KB`
    : `${formatDecimal(bytes / (1024 * 1024), 1)} MB`;
}

/** Said before the upload starts, so a 40 MB video is refused at once instead of after the wait. */
function refusal(file: File): string | null {
  if (file.size > ATTACHMENT_MAX_BYTES)
    return `${file.name} is ${size(file.size)}: the limit is ${MAX_MB} MB.`;
  if (file.size === 0) return `${file.name} is empty.`;
  return null;
}

export function AttachmentsPanel({ jobId, mayUpload }: { jobId: number; mayUpload: boolean }) {
  const attachments = useQuery(jobQueries.attachments(jobId));
  const upload = useUploadAttachment(jobId);
  const [progress, setProgress] = useState<number | null>(null);
  const [caption, setCaption] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const items = attachments.data?.items ?? [];

  const send = (file: File) => {
    const refused = refusal(file);
    setProblem(refused);
    if (refused) return;
    setProgress(0);
    upload.mutate(
      { file, caption, onProgress: setProgress },
      {
        onSuccess: () => setCaption(''),
        onSettled: () => {
          setProgress(null);
          if (input.current) input.current.value = '';
        },
      },
    );
  };

  return (
    <Panel>
      <h2 className="text-xl font-bold">Photos and documents</h2>
      {attachments.isError ? (
        <p role="alert" className="mt-2 text-lg font-bold text-fail">
          The attachments could not be loaded: {errorText(attachments.error)}
        </p>
      ) : null}
      {attachments.isSuccess && items.length === 0 ? (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          Nothing attached yet.{' '}
          {mayUpload ? 'A photo of the gauge or the filter you took out helps the customer see it.' : ''}
        </p>
      ) : null}
      {items.length > 0 ? (
        <ul className="mt-3 grid grid-cols-2 gap-3 sm:grid-cols-3 xl:grid-cols-4">
          {items.map((attachment) => (
            <AttachmentTile key={attachment.id} attachment={attachment} />
          ))}
        </ul>
      ) : null}
      {mayUpload ? (
        <div className="mt-4 grid gap-3 border-t-2 border-rule pt-4">
          <FormField
            label="Caption (optional)"
            value={caption}
            maxLength={500}
            onChange={(e) => setCaption(e.target.value)}
          />
          <div className="grid gap-1">
            <label htmlFor={`upload-${jobId}`} className="text-base font-bold">
              File
            </label>
            <p id={`upload-${jobId}-hint`} className="text-base text-ink-soft">
              A photo (JPEG, PNG, WebP, HEIC) or a PDF, up to {MAX_MB} MB
            </p>
            <input
              ref={input}
              id={`upload-${jobId}`}
              type="file"
              aria-describedby={`upload-${jobId}-hint`}
              accept={ATTACHMENT_CONTENT_TYPES.join(',')}
              disabled={upload.isPending}
              className="min-h-touch w-full min-w-0 text-lg file:mr-3 file:min-h-touch file:rounded-plate file:border-2 file:border-ink file:bg-panel file:px-4 file:font-bold file:text-ink"
              onChange={(event) => {
                const file = event.target.files?.[0];
                if (file) send(file);
              }}
            />
          </div>
          <div aria-live="polite">
            {progress !== null ? (
              <div className="grid gap-1">
                <progress className="h-4 w-full" max={1} value={progress} aria-label="Upload progress" />
                <span className="text-base">Uploading… {formatDecimal(progress * 100, 0)} %</span>
              </div>
            ) : null}
            {upload.isSuccess && progress === null ? (
              <p className="text-base">Uploaded {upload.data.filename}.</p>
            ) : null}
            {problem ? (
              <p role="alert" className="text-base font-bold text-fail">
                {problem}
              </p>
            ) : null}
            {upload.isError ? (
              <p role="alert" className="text-base font-bold text-fail">
                Not uploaded: {errorText(upload.error)}
              </p>
            ) : null}
          </div>
          {upload.isError ? (
            <Button variant="secondary" onClick={() => input.current?.click()}>
              Choose another file
            </Button>
          ) : null}
        </div>
      ) : null}
    </Panel>
  );
}

function AttachmentTile({ attachment }: { attachment: Attachment }) {
  // Browsers other than Safari cannot draw HEIC; those and PDFs get a labelled tile instead.
  const drawable = ['image/jpeg', 'image/png', 'image/webp'].includes(attachment.contentType);
  return (
    <li className="grid content-start gap-1 rounded-plate border-2 border-rule p-2">
      <a href={attachment.url} target="_blank" rel="noreferrer" className="block">
        {drawable ? (
          <img
            src={attachment.url}
            alt={attachment.caption ?? attachment.filename}
            loading="lazy"
            className="aspect-square w-full rounded-plate object-cover"
          />
        ) : (
          <span className="grid aspect-square w-full place-items-center rounded-plate bg-ground text-xl font-bold">
            {attachment.contentType === 'application/pdf' ? 'PDF' : 'HEIC'}
          </span>
        )}
      </a>
      <span className="truncate text-base font-bold">{attachment.caption ?? attachment.filename}</span>
      <span className="text-sm text-ink-soft">{size(attachment.sizeBytes)}</span>
    </li>
  );
}
