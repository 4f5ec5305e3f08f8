import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { type PolicyVersion, policyUpdateSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Checkbox } from '@/components/checkbox';
import { PercentField } from '@/components/percent-field';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextAreaField } from '@/components/text-area-field';
import { TextField } from '@/components/text-field';
import { useUpdatePolicy } from '@/features/policy/api/update-policy';
import { StabilityRulesFields } from '@/features/policy/components/stability-rules-fields';

/**
 * The admin's form for a new version of the adoption policy. Saving never changes a stored
 * version or a verdict already given; new analyses and re-evaluations use the new version.
 */
export function PolicyForm({ current, onSaved }: { current: PolicyVersion; onSaved: (version: PolicyVersion) => void }) {
  const update = useUpdatePolicy();
  const { version: _version, ...fields } = current.policy;
  const {
    register,
    handleSubmit,
    control,
    setError,
    reset,
    formState: { errors, isDirty },
  } = useForm({ resolver: zodResolver(policyUpdateSchema), defaultValues: { ...fields, reason: '' } });
  const swapEnabled = useWatch({ control, name: 'swapRule.enabled' });
  // mutateAsync, not mutate's callbacks: the page remounts the form for the new version.
  const onSubmit = handleSubmit(async (values) => {
    let version: PolicyVersion;
    try {
      version = await update.mutateAsync(values);
    } catch (error) {
      applyServerFieldErrors(error, setError, ['alpha', 'sided', 'materialityGiniPoints', 'minBads', 'quorum', 'reason', 'swapRule.approvalRate', 'segmentRule.minBads']);
      return;
    }
    const { version: _saved, ...next } = version.policy;
    reset({ ...next, reason: '' });
    onSaved(version);
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6" aria-label="Change the adoption policy">
      {update.isError ? (
        <Alert tone="error" title="The policy was not changed">
          <p>{errorMessage(update.error)}</p>
        </Alert>
      ) : null}
      <div className="grid gap-5 sm:grid-cols-2">
        <TextField
          label="Significance level α"
          type="number"
          inputMode="decimal"
          step={0.001}
          min={0.001}
          max={0.499}
          hint="For the DeLong test of ΔGini; 0.05 is usual."
          error={errors.alpha?.message}
          {...register('alpha', { valueAsNumber: true })}
        />
        <RadioGroup legend="Test" error={errors.sided?.message}>
          <Radio label="One-sided: the challenger is better" value="one-sided" {...register('sided')} />
          <Radio label="Two-sided: the models differ" value="two-sided" {...register('sided')} />
        </RadioGroup>
        <TextField
          label="Materiality (Gini points)"
          type="number"
          inputMode="decimal"
          step={0.1}
          min={0}
          max={100}
          hint="The smallest ΔGini worth a model change."
          error={errors.materialityGiniPoints?.message}
          {...register('materialityGiniPoints', { valueAsNumber: true })}
        />
        <TextField
          label="Minimum bads in the holdout"
          type="number"
          inputMode="numeric"
          step={1}
          min={0}
          error={errors.minBads?.message}
          {...register('minBads', { valueAsNumber: true })}
        />
        <Checkbox
          label="Require the lower bound of the ΔGini interval to be above 0"
          className="sm:col-span-2"
          {...register('requireIntervalAboveZero')}
        />
        <div className="space-y-3 sm:col-span-2">
          <Checkbox label="Check the swap sets: swap-in bad rate not above swap-out" {...register('swapRule.enabled')} />
          {swapEnabled ? (
            <Controller
              control={control}
              name="swapRule.approvalRate"
              render={({ field }) => (
                <PercentField
                  label="At this approval rate"
                  className="max-w-xs"
                  value={field.value}
                  onChange={field.onChange}
                  onBlur={field.onBlur}
                  name={field.name}
                  error={errors.swapRule?.approvalRate?.message}
                  min={1}
                  max={99}
                />
              )}
            />
          ) : null}
          {swapEnabled ? (
            <Checkbox
              label="Must also hold at the worst case"
              hint="For holdouts with applicants without an outcome: the swap-in's bad rate with every such applicant bad must not be above the swap-out's with every such applicant good."
              {...register('swapRule.worstCase')}
            />
          ) : null}
        </div>
        <div className="space-y-3 sm:col-span-2">
          <Checkbox label="No segment value significantly worse (Holm-adjusted two-sided test)" {...register('segmentRule.enabled')} />
          <TextField
            label="Leave out segment values with fewer bads than"
            type="number"
            inputMode="numeric"
            step={1}
            min={0}
            className="max-w-xs"
            error={errors.segmentRule?.minBads?.message}
            {...register('segmentRule.minBads', { valueAsNumber: true })}
          />
        </div>
        <StabilityRulesFields register={register} control={control} errors={errors} />
        <TextField
          label="Quorum of committee votes"
          type="number"
          inputMode="numeric"
          step={1}
          min={0}
          hint="Votes needed before a decision can be recorded; 0 for none."
          error={errors.quorum?.message}
          {...register('quorum', { valueAsNumber: true })}
        />
      </div>
      <TextAreaField
        label="Why the policy changes"
        hint="Kept with the new version and in the audit trail."
        error={errors.reason?.message}
        rows={3}
        {...register('reason')}
      />
      <div className="flex flex-wrap items-center gap-3 border-t border-line pt-4">
        <Button type="submit" variant="primary" loading={update.isPending} loadingText="Saving…">
          Save as version {current.policy.version + 1}
        </Button>
        {!isDirty ? <span className="text-sm text-ink-soft">Change a rule and give the reason.</span> : null}
      </div>
    </form>
  );
}
