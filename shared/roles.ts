import { z } from 'zod';

/** The five roles of docs/design.md ("Workflow and roles"); a person may hold several. */
export const roles = ['admin', 'modeler', 'analyst', 'policy', 'committee'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  modeler: 'Modeler',
  analyst: 'Analyst (validation)',
  policy: 'Credit policy',
  committee: 'Committee',
};
