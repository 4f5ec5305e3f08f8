import { type StepItem } from '@/components/steps';

/**
 * The new-comparison wizard. Upload and name happen on /comparisons/new (the draft is stored
 * after naming); columns, check and settings on /comparisons/:id/setup, which a draft resumes;
 * the run's progress is shown on the comparison's own page, which then shows the verdict.
 */
export const wizardSteps: StepItem[] = [
  { key: 'upload', label: 'Upload' },
  { key: 'details', label: 'Name' },
  { key: 'mapping', label: 'Columns' },
  { key: 'check', label: 'Check' },
  { key: 'settings', label: 'Settings' },
  { key: 'run', label: 'Run' },
];
