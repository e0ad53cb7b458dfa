import { z } from 'zod';
import { JOBS_PATH } from './jobs';

/** The customer's diagnostic report of a job, as a PDF (PRODUCT.md, "Customer diagnostic report"). */
export const JOB_REPORT_PDF_PATH = `${JOBS_PATH}/:id/report.pdf`;
export const jobReportPdfPath = (jobId: number) => `${JOBS_PATH}/${jobId}/report.pdf`;

/** Mails the report to the job's customer with the PDF attached. */
export const JOB_REPORT_SEND_PATH = `${JOBS_PATH}/:id/report/send`;
export const jobReportSendPath = (jobId: number) => `${JOBS_PATH}/${jobId}/report/send`;

/** `?paper=letter|a4`; Letter when left out, as for the invoice. */
export const PaperQuerySchema = z.strictObject({ paper: z.enum(['letter', 'a4']).default('letter') });
export type PaperQuery = z.infer<typeof PaperQuerySchema>;
