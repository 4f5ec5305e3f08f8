import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { type AnalysisSettings, analysisSettingsSchema, defaultRejectInference, type RejectInference, rejectInferenceSchema } from '@shared/report';
import { Button } from '@/components/button';
import { Select } from '@/components/select';
import { TextField } from '@/components/text-field';
import { PercentField } from '@/components/percent-field';

/** The settings asked for in the wizard; the rest keep the schema's defaults. */
export const settingsFormSchema = analysisSettingsSchema
  .pick({ bootstrap: true, seed: true, confidence: true, approvalRate: true })
  .extend({ rejectInference: rejectInferenceSchema.default(defaultRejectInference) });
export type SettingsFormValues = Pick<AnalysisSettings, 'bootstrap' | 'seed' | 'confidence' | 'approvalRate'> & { rejectInference: RejectInference };

export const settingsDefaults: SettingsFormValues = settingsFormSchema.parse({});

/** Plain messages for the shared schema's limits, by field. */
const messages: Record<string, string> = {
  bootstrap: 'Enter a whole number from 0 to 20,000',
  seed: 'Enter a whole number from 0 to 2,147,483,647',
  confidence: 'Choose a confidence level',
  approvalRate: 'Enter a percentage above 0 and below 100',
  rejectInference: 'Enter a parcel factor above 0 and at most 20',
};
const errorMap = (issue: { path?: PropertyKey[] }) => messages[String(issue.path?.[0])] ?? undefined;

const inferenceOptions = [
  { value: 'known-only', label: 'Known outcomes only, with the bounds beside them' },
  { value: 'parcel', label: 'Parcelling by champion score band' },
  { value: 'column', label: 'The inferred probability of bad column' },
];

const confidenceOptions = [0.9, 0.95, 0.99].map((value) => ({ value: String(value), label: `${Math.round(value * 100)}%` }));

/** Step 5: bootstrap replicates, seed, confidence and the approval rate for the swap sets. */
export function AnalysisSettingsForm({ initial, onBack, onSubmit, busy, withUnknown = false, withInferredColumn = false }: {
  initial: SettingsFormValues;
  /** The mapping keeps applicants without an outcome: ask how their bad rate is stated. */
  withUnknown?: boolean;
  /** The mapping has an inferred-bad column. */
  withInferredColumn?: boolean;
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
  const inferenceMethod = useWatch({ control, name: 'rejectInference.method' });

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
      {withUnknown ? (
        <fieldset className="grid gap-5 md:grid-cols-2">
          <legend className="mb-2 text-base font-semibold text-ink">Reject inference</legend>
          <p className="text-sm text-ink-soft md:col-span-2">
            The swap-in is mostly applicants the champion declined, whose outcome is not known. Choose how their bad rate is stated; the
            choice is recorded with the report and named beside every figure it touches. The bounds (every unknown applicant good, every one
            bad) are always shown.
          </p>
          <Select
            label="How to state the unknown applicants' bad rate"
            options={withInferredColumn ? inferenceOptions : inferenceOptions.filter((option) => option.value !== 'column')}
            {...register('rejectInference.method')}
          />
          {inferenceMethod === 'parcel' ? (
            <TextField
              label="Parcel factor"
              type="number"
              inputMode="decimal"
              min={0.1}
              max={20}
              step={0.1}
              hint="An unknown applicant in a champion score band counts this many times the band's known bad rate (at most 1). 1 assumes declined applicants are as risky as accepted ones of the same band; 2 to 4 is usual."
              error={errors.rejectInference?.parcelFactor?.message ?? errors.rejectInference?.message}
              {...register('rejectInference.parcelFactor', { valueAsNumber: true })}
            />
          ) : null}
        </fieldset>
      ) : null}
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
