import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { ATTACHMENT_FILE_FIELD, AttachmentSchema, attachmentsPath } from '../../../../shared/api/attachments';
import type { Attachment } from '../../../../shared/api/attachments';
import { ErrorBodySchema } from '../../../../shared/api/errors';
import {
  JobSchema,
  JOBS_PATH,
  jobNotesPath,
  jobStatusPath,
  type CreateJobInput,
  type JobStatus,
} from '../../../../shared/api/jobs';
import {
  jobLineItemsPath,
  LineItemSchema,
  type CreateLineItemInput,
  type UpdateLineItemInput,
} from '../../../../shared/api/line-items';
import { jobReadingsPath, ReadingSchema, type CreateReadingInput } from '../../../../shared/api/readings';
import {
  EstimateCreatedSchema,
  estimateApprovePath,
  estimateDeclinePath,
  EstimateSchema,
  jobEstimatePath,
} from '../../../../shared/api/estimates';
import { jobReportSendPath } from '../../../../shared/api/job-documents';
import { OutboxItemSchema } from '../../../../shared/api/outbox';
import { ApiError, CLIENT_ERROR_CODES, jsonInit, request } from '../../../lib/api-client';
import { jobQueries } from './queries';

function sendJson<Schema extends z.ZodType>(
  method: 'POST' | 'PATCH' | 'DELETE',
  path: string,
  schema: Schema,
  body?: unknown,
) {
  return request(path, schema, jsonInit(method, body));
}

const NoContentSchema = z.undefined();

export function useCreateJob() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateJobInput) => sendJson('POST', JOBS_PATH, JobSchema, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: jobQueries.lists() }),
  });
}

/** A status move or a note changes the job and its timeline, and what the lists show. */
function useJobChange<Input, Output>(jobId: number, send: (input: Input) => Promise<Output>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: jobQueries.detail(jobId).queryKey, exact: true }),
        queryClient.invalidateQueries({ queryKey: jobQueries.lists() }),
      ]);
    },
  });
}

export function useChangeJobStatus(jobId: number) {
  return useJobChange(jobId, (input: { status: JobStatus; note?: string }) =>
    sendJson('POST', jobStatusPath(jobId), JobSchema, input),
  );
}

export function useAddJobNote(jobId: number) {
  return useJobChange(jobId, (input: { note: string }) =>
    sendJson('POST', jobNotesPath(jobId), z.unknown(), input),
  );
}

export function useAddReading(jobId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateReadingInput) => sendJson('POST', jobReadingsPath(jobId), ReadingSchema, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: jobQueries.readings(jobId).queryKey }),
  });
}

function useLineChange<Input, Output>(jobId: number, send: (input: Input) => Promise<Output>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: jobQueries.lineItems(jobId).queryKey }),
  });
}

export function useAddLineItem(jobId: number) {
  return useLineChange(jobId, (input: CreateLineItemInput) =>
    sendJson('POST', jobLineItemsPath(jobId), LineItemSchema, input),
  );
}

export function useUpdateLineItem(jobId: number) {
  return useLineChange(jobId, ({ itemId, ...input }: UpdateLineItemInput & { itemId: number }) =>
    sendJson('PATCH', `${jobLineItemsPath(jobId)}/${itemId}`, LineItemSchema, input),
  );
}

export function useDeleteLineItem(jobId: number) {
  return useLineChange(jobId, (itemId: number) =>
    sendJson('DELETE', `${jobLineItemsPath(jobId)}/${itemId}`, NoContentSchema),
  );
}

/**
 * Uploads one file as multipart form data. XMLHttpRequest rather than fetch, because only it
 * reports upload progress: a 6 MB photo on the van's hotspot takes long enough to need a bar.
 */
export function uploadAttachment(
  jobId: number,
  file: File,
  caption: string,
  onProgress: (fraction: number) => void,
): Promise<Attachment> {
  const form = new FormData();
  if (caption.trim() !== '') form.set('caption', caption.trim());
  form.set(ATTACHMENT_FILE_FIELD, file);
  const path = attachmentsPath(jobId);
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress(event.loaded / event.total);
    };
    xhr.onerror = () =>
      reject(new ApiError(0, CLIENT_ERROR_CODES.network, `No answer from the server for ${path}`));
    xhr.onload = () => {
      let body: unknown;
      try {
        body = xhr.responseText === '' ? undefined : JSON.parse(xhr.responseText);
      } catch {
        body = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = AttachmentSchema.safeParse(body);
        if (parsed.success) resolve(parsed.data);
        else
          reject(
            new ApiError(
              xhr.status,
              CLIENT_ERROR_CODES.invalidResponse,
              'The upload answer was not understood',
            ),
          );
        return;
      }
      const error = ErrorBodySchema.safeParse(body);
      reject(
        error.success
          ? new ApiError(
              xhr.status,
              error.data.error.code,
              error.data.error.message,
              error.data.error.details,
            )
          : new ApiError(xhr.status, CLIENT_ERROR_CODES.unreadableError, `The server answered ${xhr.status}`),
      );
    };
    xhr.send(form);
  });
}

export function useUploadAttachment(jobId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({
      file,
      caption,
      onProgress,
    }: {
      file: File;
      caption: string;
      onProgress: (f: number) => void;
    }) => uploadAttachment(jobId, file, caption, onProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: jobQueries.attachments(jobId).queryKey }),
  });
}

export function useSendEstimate(jobId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (note: string) =>
      sendJson(
        'POST',
        jobEstimatePath(jobId),
        EstimateCreatedSchema,
        note.trim() ? { note: note.trim() } : {},
      ),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: jobQueries.estimates(jobId).queryKey }),
        // Sending the estimate moves the job to awaiting approval.
        queryClient.invalidateQueries({ queryKey: jobQueries.detail(jobId).queryKey, exact: true }),
        queryClient.invalidateQueries({ queryKey: jobQueries.lists() }),
      ]),
  });
}

/** The customer's yes or no (or the owner recording it, with how it was given). */
export function useDecideEstimate(jobId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({
      estimateId,
      decision,
      note,
    }: {
      estimateId: number;
      decision: 'approve' | 'decline';
      note: string;
    }) =>
      sendJson(
        'POST',
        decision === 'approve' ? estimateApprovePath(estimateId) : estimateDeclinePath(estimateId),
        EstimateSchema,
        note.trim() ? { note: note.trim() } : {},
      ),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: jobQueries.estimates(jobId).queryKey }),
        queryClient.invalidateQueries({ queryKey: jobQueries.detail(jobId).queryKey, exact: true }),
        queryClient.invalidateQueries({ queryKey: jobQueries.lists() }),
      ]),
  });
}

/** Mails the report; the answer is its outbox row: sent, or refused for now and retried on its own. */
export function useSendReport(jobId: number) {
  return useMutation({
    mutationFn: (again: boolean) =>
      sendJson('POST', `${jobReportSendPath(jobId)}${again ? '?again=true' : ''}`, OutboxItemSchema),
  });
}
