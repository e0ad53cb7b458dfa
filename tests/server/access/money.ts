import type { AccessRow } from './types';

export const moneyRows: AccessRow[] = [];
