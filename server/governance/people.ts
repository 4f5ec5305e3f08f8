/** How governance names people and dates: one copy each, in users/present.ts and shared/format.ts. */
export { personRef } from '../users/present';
export { iso } from '@shared/format';
