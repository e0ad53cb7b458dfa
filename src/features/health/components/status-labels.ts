import type { Tone } from '../../../components/ui/tone';
import type { ServerStatus } from '../api/queries';

export const statusTone: Record<ServerStatus, Tone> = {
  checking: 'quiet',
  online: 'pass',
  'not-ready': 'warn',
  unreachable: 'fail',
};
