import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { JOB_STATUS_LABELS, type JobStatus } from '../../../../shared/api/jobs';

/** Work waiting on the customer or on money is a warning; finished work passes; the rest is under way. */
const STATUS_TONES: Record<JobStatus, Tone> = {
  booked: 'quiet',
  on_site: 'quiet',
  diagnosing: 'quiet',
  awaiting_approval: 'warn',
  repairing: 'quiet',
  complete: 'pass',
  invoiced: 'warn',
  paid: 'pass',
  cancelled: 'quiet',
};

export function JobStatusPill({ status }: { status: JobStatus }) {
  return <StatusPill tone={STATUS_TONES[status]}>{JOB_STATUS_LABELS[status]}</StatusPill>;
}
