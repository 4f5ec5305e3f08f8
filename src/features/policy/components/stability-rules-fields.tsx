import { type Control, type FieldErrors, type UseFormRegister, useWatch } from 'react-hook-form';
import { type z } from 'zod';
import { type policyUpdateSchema } from '@shared/governance';
import { Checkbox } from '@/components/checkbox';
import { TextField } from '@/components/text-field';

/** The form's values as the schema takes them (the criteria are optional there, defaults filled). */
type Form = z.input<typeof policyUpdateSchema>;

/** The calibration and stability criteria of the adoption policy, each off by default, with its own figure. */
export function StabilityRulesFields({ register, control, errors }: { register: UseFormRegister<Form>; control: Control<Form>; errors: FieldErrors<Form> }) {
  const calibration = useWatch({ control, name: 'calibrationRule.enabled' });
  const psi = useWatch({ control, name: 'psiRule.enabled' });
  const periods = useWatch({ control, name: 'periodSignRule.enabled' });
  return (
    <div className="space-y-4 sm:col-span-2">
      <div className="space-y-2">
        <Checkbox label="A PD challenger's portfolio Jeffreys p must be above α (its PDs not underestimated)" {...register('calibrationRule.enabled')} />
        {calibration ? (
          <TextField
            label="α of the Jeffreys test"
            className="max-w-xs"
            type="number"
            inputMode="decimal"
            step={0.001}
            min={0.001}
            max={0.499}
            hint="Also marks the bands or grades that fail on the Calibration tab."
            error={errors.calibrationRule?.alpha?.message}
            {...register('calibrationRule.alpha', { valueAsNumber: true })}
          />
        ) : null}
      </div>
      <div className="space-y-2">
        <Checkbox label="The challenger's score PSI against the reference sample must be below a threshold" {...register('psiRule.enabled')} />
        {psi ? (
          <TextField
            label="PSI threshold"
            className="max-w-xs"
            type="number"
            inputMode="decimal"
            step={0.01}
            min={0.01}
            hint="0.25 is the usual line for a shifted population (common practice, no source)."
            error={errors.psiRule?.threshold?.message}
            {...register('psiRule.threshold', { valueAsNumber: true })}
          />
        ) : null}
      </div>
      <div className="space-y-2">
        <Checkbox label="The uplift must keep its sign in every period with enough bads" {...register('periodSignRule.enabled')} />
        {periods ? (
          <TextField
            label="Bads a period needs to count"
            className="max-w-xs"
            type="number"
            inputMode="numeric"
            step={1}
            min={1}
            error={errors.periodSignRule?.minBads?.message}
            {...register('periodSignRule.minBads', { valueAsNumber: true })}
          />
        ) : null}
      </div>
    </div>
  );
}
