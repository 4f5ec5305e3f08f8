import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { type AnalysisSettings, analysisSettingsSchema } from '@shared/report';
import { Button } from '@/components/button';
import { Select } from '@/components/select';
import { TextField } from '@/components/text-field';
import { PercentField } from '@/components/percent-field';

/** The settings asked for in the wizard; the rest keep the schema's defaults. */
export const settingsFormSchema = analysisSettingsSchema.pick({ bootstrap: true, seed: true, confidence: true, approvalRate: true });
export type SettingsFormValues = Pick<AnalysisSettings, 'bootstrap' | 'seed' | 'confidence' | 'approvalRate'>;

export const settingsDefaults: SettingsFormValues = settingsFormSchema.parse({});

/** Plain messages for the shared schema's limits, by field. */
const messages: Record<string, string> = {
  bootstrap: 'Enter a whole number from 0 to 20,000',
  seed: 'Enter a whole number from 0 to 2,147,483,647',
  confidence: 'Choose a confidence level',
  approvalRate: 'Enter a percentage above 0 and below 100',
};
const errorMap = (issue: { path?: PropertyKey[] }) => messages[String(issue.path?.[0])] ?? undefined;

const confidenceOptions = [0.9, 0.95, 0.99].map((value) => ({ value: String(value), label: `${Math.round(value * 100)}%` }));

/** Step 5: bootstrap replicates, seed, confidence and the approval rate for the swap sets. */
export function AnalysisSettingsForm({ initial, onBack, onSubmit, busy }: {
  initial: SettingsFormValues;
  onBack: () => void;
  onSubmit: (values: SettingsFormValues) => void;
  busy?: boolean;
}) {
  const {
    register,
    handleSubmit,
    control,
    formState: { errors },
  } = useForm({ resolver: zodResolver(settingsFormSchema, { error: errorMap }), defaultValues: initial });

  return (
    <form onSubmit={handleSubmit((values) => onSubmit(values as SettingsFormValues))} noValidate className="space-y-6">
      <div className="grid gap-5 md:grid-cols-2">
        <TextField
          label="Bootstrap replicates"
          type="number"
          inputMode="numeric"
          min={0}
          max={20000}
          step={100}
          hint="Paired, stratified by outcome: intervals for KS and a cross-check of the DeLong interval. 0 skips it (no KS intervals, no histograms). 2,000 is usual; fewer runs faster."
          error={errors.bootstrap?.message}
          {...register('bootstrap', { valueAsNumber: true })}
        />
        <TextField
          label="Random seed"
          type="number"
          inputMode="numeric"
          min={0}
          step={1}
          hint="The same seed, file and settings give the same numbers, so the result can be reproduced."
          error={errors.seed?.message}
          {...register('seed', { valueAsNumber: true })}
        />
        <Controller
          control={control}
          name="confidence"
          render={({ field }) => (
            <Select
              label="Confidence of every interval"
              value={String(field.value)}
              onChange={(event) => field.onChange(Number(event.target.value))}
              onBlur={field.onBlur}
              name={field.name}
              ref={field.ref}
              error={errors.confidence?.message}
              options={confidenceOptions}
            />
          )}
        />
        <Controller
          control={control}
          name="approvalRate"
          render={({ field }) => (
            <PercentField
              label="Approval rate for the swap sets"
              hint="Both models' cut-offs are set to approve this share of the holdout. It can be changed later on the swap-sets page."
              value={field.value ?? Number.NaN}
              onChange={field.onChange}
              onBlur={field.onBlur}
              name={field.name}
              error={errors.approvalRate?.message}
              min={1}
              max={99}
            />
          )}
        />
      </div>
      <div className="flex flex-wrap gap-2 border-t border-line pt-4">
        <Button onClick={onBack} disabled={busy}>
          Back to the check
        </Button>
        <Button type="submit" variant="primary" loading={busy} loadingText="Starting the analysis…">
          Run the analysis
        </Button>
      </div>
    </form>
  );
}
