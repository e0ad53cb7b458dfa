import type { AccessRow } from './types';

export const jobRecordRows: AccessRow[] = [];
