import type { AccessRow } from './types';

export const workshopRows: AccessRow[] = [];
