import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { canSetUp } from '@shared/workflow';
import { useCallback, useState } from 'react';
import { type LoaderFunctionArgs, useNavigate, useParams } from 'react-router';
import { type ValidationReport } from '@shared/comparisons';
import { type ColumnMapping, inferenceOf } from '@shared/report';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { Button, ButtonLink } from '@/components/button';
import { Alert, Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { DocumentTitle } from '@/components/document-title';
import { PageHeader } from '@/components/page-header';
import { Steps } from '@/components/steps';
import { comparisonQueryOptions, isRunActive } from '@/features/comparisons/api/get-comparison';
import { type ReferenceChoice, ReferenceSampleField } from '@/features/holdouts/components/reference-sample-field';
import { useSetupComparison } from '@/features/comparisons/api/setup-comparison';
import { AnalysisSettingsForm, type SettingsFormValues, settingsDefaults } from '@/features/comparisons/components/analysis-settings-form';
import { holdoutQueryOptions } from '@/features/holdouts/api/get-holdout';
import { useValidateMapping } from '@/features/holdouts/api/validate-mapping';
import { HoldoutPreviewTable } from '@/features/holdouts/components/holdout-preview-table';
import { HoldoutSummary } from '@/features/holdouts/components/holdout-summary';
import { MappingForm } from '@/features/holdouts/components/mapping-form';
import { RowErrorsTable } from '@/features/holdouts/components/row-errors-table';
import { ValidationReportView } from '@/features/holdouts/components/validation-report-view';
import { rowErrorsFrom } from '@/features/holdouts/lib/row-errors';
import { requireRole } from '@/app/guards';
import { comparisonIdFrom } from '@/app/routes/comparisons/comparison-id';
import { wizardSteps } from '@/app/routes/comparisons/wizard-steps';

export const loader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  await requireRole(queryClient, request, 'Setting up a comparison', 'modeler');
  const id = comparisonIdFrom(params);
  const comparison = await queryClient.ensureQueryData(comparisonQueryOptions(id));
  await queryClient.ensureQueryData(holdoutQueryOptions(comparison.holdout.id));
  return null;
};

type Step = 'mapping' | 'check' | 'settings';

/** Wizard steps 3–5 for a stored comparison: map the columns, check the data, choose settings, run. */
export function Component() {
  const id = comparisonIdFrom(useParams());
  const navigate = useNavigate();
  // The loader filled the cache; a failed load shows the route's error boundary.
  const comparison = useSuspenseQuery(comparisonQueryOptions(id));
  const holdout = useSuspenseQuery(holdoutQueryOptions(comparison.data.holdout.id));
  const validate = useValidateMapping();
  const setup = useSetupComparison();

  const [step, setStep] = useState<Step>('mapping');
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [dropMissing, setDropMissing] = useState<boolean | null>(null);
  const [report, setReport] = useState<ValidationReport | null>(null);
  const [settings, setSettings] = useState<SettingsFormValues | null>(null);
  const [roles, setRoles] = useState<Record<string, string>>({});
  const [reference, setReference] = useState<ReferenceChoice>({ kind: 'none' });
  const onRolesChange = useCallback((next: Record<string, string>) => setRoles(next), []);

  const detail = comparison.data;

  const header = (
    <PageHeader eyebrow={detail.name} title={{ mapping: 'Map the columns', check: 'Check the data', settings: 'Settings' }[step]}>
      <Steps steps={wizardSteps} current={step} label="New comparison steps" />
    </PageHeader>
  );

  if (!canSetUp(detail.state) || isRunActive(detail)) {
    return (
      <>
        <DocumentTitle>{`Set up ${detail.name}`}</DocumentTitle>
        {header}
        <Callout tone="info" title={isRunActive(detail) ? 'An analysis is running' : 'This comparison cannot be changed now'}>
          <p>
            {isRunActive(detail)
              ? 'Wait for it to finish before changing the mapping or settings.'
              : 'The mapping and settings can be changed while a comparison is a draft, analysed, or returned by the analyst.'}
          </p>
        </Callout>
        <div className="mt-5">
          <ButtonLink to={paths.comparisons.detail(id)}>Back to the comparison</ButtonLink>
        </div>
      </>
    );
  }

  const startMapping = mapping ?? detail.mapping;
  const startDropMissing = dropMissing ?? detail.settings?.dropMissing ?? false;

  const check = (next: ColumnMapping, nextDropMissing: boolean) => {
    setMapping(next);
    setDropMissing(nextDropMissing);
    validate.mutate(
      { holdoutId: detail.holdout.id, mapping: next, dropMissing: nextDropMissing },
      {
        onSuccess: (result) => {
          setReport(result);
          setStep('check');
        },
      },
    );
  };

  const run = (values: SettingsFormValues) => {
    if (!mapping) return;
    setSettings(values);
    // The reject inference is recorded only for mappings that keep applicants without an outcome.
    const { rejectInference, ...rest } = values;
    setup.mutate(
      {
        id,
        mapping,
        settings: { ...rest, ...(mapping.keepUnknown ? { rejectInference } : {}), dropMissing: dropMissing ?? false, referencePeriod: reference.kind === 'period' ? reference.period : null },
        referenceHoldoutId: reference.kind === 'file' ? reference.holdout.id : null,
      },
      { onSuccess: () => navigate(paths.comparisons.detail(id)) },
    );
  };

  const setupErrors = rowErrorsFrom(setup.error);
  const failedRun = detail.latestRun?.status === 'failed' ? detail.runs.find((candidate) => candidate.id === detail.latestRun?.id) : null;

  return (
    <>
      <DocumentTitle>{`Set up ${detail.name}`}</DocumentTitle>
      {header}
      <div className="space-y-6">
        {failedRun && step === 'mapping' ? (
          <Callout tone="error" title="The last analysis failed">
            <p>{failedRun.error ?? 'It stopped without a message.'}</p>
            <p>Check the mapping below and run it again.</p>
          </Callout>
        ) : null}
        {step === 'mapping' ? (
          <>
            <Section title="The file" framed>
              <HoldoutSummary holdout={holdout.data} />
            </Section>
            <Section
              title="Preview"
              description={`The first ${holdout.data.preview.length} rows as read, with what each column looks like and the role you give it.`}
              framed
            >
              <HoldoutPreviewTable holdout={holdout.data} roles={roles} />
            </Section>
            <Section title="Columns" description="Proposed from the column names and the data; confirm or change each one." framed>
              {validate.isError ? (
                <Alert tone="error" title="The check could not run" className="mb-5">
                  <p>{errorMessage(validate.error)}</p>
                </Alert>
              ) : null}
              <MappingForm
                holdout={holdout.data}
                initial={startMapping}
                initialDropMissing={startDropMissing}
                onSubmit={check}
                onRolesChange={onRolesChange}
                busy={validate.isPending}
              />
            </Section>
          </>
        ) : null}

        {step === 'check' && report ? (
          <Section title="Validation report" description={`Every row of ${holdout.data.fileName} read with this mapping.`} framed>
            <ValidationReportView report={report} />
            <div className="mt-6 flex flex-wrap gap-2 border-t border-line pt-4">
              <Button onClick={() => setStep('mapping')}>Back to the column mapping</Button>
              {report.ok ? (
                <Button variant="primary" onClick={() => setStep('settings')}>
                  Continue to the settings
                </Button>
              ) : null}
            </div>
          </Section>
        ) : null}

        {step === 'settings' ? (
          <Section title="Analysis settings" description="Kept with the comparison, with the file's SHA-256, so the analysis can be reproduced." framed>
            {setup.isError ? (
              <Alert tone="error" title="The analysis did not start" className="mb-5">
                <p>{errorMessage(setup.error)}</p>
              </Alert>
            ) : null}
            {setupErrors.length > 0 ? (
              <div className="mb-5 space-y-3">
                <RowErrorsTable errors={setupErrors} />
                <Button onClick={() => setStep('mapping')}>Back to the column mapping</Button>
              </div>
            ) : null}
            {mapping ? (
              <div className="mb-5">
                <ReferenceSampleField value={reference} onChange={setReference} periodColumn={mapping.period ?? null} scoreColumns={{ champion: mapping.champion, challenger: mapping.challenger }} />
              </div>
            ) : null}
            <AnalysisSettingsForm
              initial={
                settings ??
                (detail.settings
                  ? {
                      bootstrap: detail.settings.bootstrap,
                      seed: detail.settings.seed,
                      confidence: detail.settings.confidence,
                      approvalRate: detail.settings.approvalRate,
                      rejectInference: inferenceOf(detail.settings),
                    }
                  : settingsDefaults)
              }
              withUnknown={mapping?.keepUnknown ?? false}
              withInferredColumn={Boolean(mapping?.inferredBad)}
              onBack={() => setStep('check')}
              onSubmit={run}
              busy={setup.isPending}
            />
          </Section>
        ) : null}
      </div>
    </>
  );
}
