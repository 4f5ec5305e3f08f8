import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { type LoaderFunctionArgs } from 'react-router';
import { hasRole, useUser } from '@/lib/auth';
import { Alert, Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { DocumentTitle } from '@/components/document-title';
import { PageHeader } from '@/components/page-header';
import { policyQueryOptions } from '@/features/policy/api/get-policy';
import { policyVersionsQueryOptions } from '@/features/policy/api/get-policy-versions';
import { PolicyForm } from '@/features/policy/components/policy-form';
import { PolicyHistory } from '@/features/policy/components/policy-history';
import { PolicySummary } from '@/features/policy/components/policy-summary';
import { requireUser } from '@/app/guards';

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireUser(queryClient, request);
  await Promise.all([queryClient.ensureQueryData(policyQueryOptions()), queryClient.ensureQueryData(policyVersionsQueryOptions())]);
  return null;
};

/** The adoption policy: everyone reads the current rules and their history; admins make new versions. */
export function Component() {
  const { data: user } = useUser();
  // The loader filled the cache; a failed load shows the route's error boundary.
  const policy = useSuspenseQuery(policyQueryOptions());
  const versions = useSuspenseQuery(policyVersionsQueryOptions());
  const [notice, setNotice] = useState<string | null>(null);
  const isAdmin = hasRole(user, 'admin');

  return (
    <>
      <DocumentTitle>Adoption policy</DocumentTitle>
      <PageHeader
        eyebrow="Governance"
        title="Adoption policy"
        subtitle="The rules that turn a comparison's evidence into a recommendation. Each verdict names the version it used; a new version never rewrites a verdict already given."
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="min-w-0 space-y-6">
          {notice ? (
            <Alert tone="success" onDismiss={() => setNotice(null)}>
              <p>{notice}</p>
            </Alert>
          ) : null}
          <Section title={`Current rules (version ${policy.data.policy.version})`}>
            <PolicySummary version={policy.data} />
          </Section>
          {isAdmin ? (
            <Section title="Make a new version" description="New analyses and re-evaluations use it from the moment it is saved.">
              <PolicyForm
                key={policy.data.policy.version}
                current={policy.data}
                onSaved={(version) => setNotice(`Version ${version.policy.version} is now the adoption policy.`)}
              />
            </Section>
          ) : (
            <Callout tone="info" title="Only administrators change the policy">
              <p>Ask an administrator if a rule should change; they record why with the new version.</p>
            </Callout>
          )}
          <Callout tone="caution" title="The policy advises; people decide">
            <p>
              Meeting every rule is statistical evidence, not business approval. A new model changes who is approved and declined, so fair-lending
              and adverse-action duties apply. Set these rules under your institution’s model risk policy, local regulation and licensed advice.
            </p>
          </Callout>
        </div>
        <Section title="Version history" className="self-start">
          <PolicyHistory versions={versions.data} />
        </Section>
      </div>
    </>
  );
}
