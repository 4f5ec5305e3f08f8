import { type QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { type LoaderFunctionArgs, useNavigate } from 'react-router';
import { type HoldoutInfo } from '@shared/comparisons';
import { paths } from '@/config/paths';
import { Section } from '@/components/card';
import { DocumentTitle } from '@/components/document-title';
import { PageHeader } from '@/components/page-header';
import { Steps } from '@/components/steps';
import { ComparisonDetailsForm } from '@/features/comparisons/components/comparison-details-form';
import { HoldoutSummary } from '@/features/holdouts/components/holdout-summary';
import { UploadHoldoutForm } from '@/features/holdouts/components/upload-holdout-form';
import { requireRole } from '@/app/guards';
import { wizardSteps } from '@/app/routes/comparisons/wizard-steps';

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireRole(queryClient, request, 'New comparison', 'modeler');
  return null;
};

/** Wizard steps 1–2: upload the holdout, name the comparison; then on to the column mapping. */
export function Component() {
  const navigate = useNavigate();
  const [holdout, setHoldout] = useState<HoldoutInfo | null>(null);
  const step = holdout ? 'details' : 'upload';

  return (
    <>
      <DocumentTitle>New comparison</DocumentTitle>
      <PageHeader
        eyebrow="New comparison"
        title={holdout ? 'Name the comparison' : 'Upload the holdout'}
        subtitle="An out-of-time holdout scored by both models. The file is kept with its SHA-256, so the comparison can be re-run and audited later."
      >
        <Steps steps={wizardSteps} current={step} label="New comparison steps" />
      </PageHeader>
      {holdout ? (
        <div className="space-y-6">
          <Section title="Uploaded" framed>
            <HoldoutSummary holdout={holdout} />
          </Section>
          <Section title="Name and description" framed>
            <ComparisonDetailsForm
              holdoutId={holdout.id}
              fileName={holdout.fileName}
              onBack={() => setHoldout(null)}
              onCreated={(id) => navigate(paths.comparisons.setup(id))}
            />
          </Section>
        </div>
      ) : (
        <Section title="Holdout file" framed>
          <UploadHoldoutForm onUploaded={setHoldout} />
        </Section>
      )}
    </>
  );
}
