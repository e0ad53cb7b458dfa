import type { AccessRow } from './types';

export const careRows: AccessRow[] = [];
