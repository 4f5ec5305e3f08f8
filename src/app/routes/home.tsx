import { type QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs } from 'react-router';
import { paths } from '@/config/paths';
import { useUser } from '@/lib/auth';
import { ButtonLink } from '@/components/button';
import { Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { DocumentTitle } from '@/components/document-title';
import { PageHeader } from '@/components/page-header';
import { OtherRoles, RoleOverview } from '@/features/welcome/components/role-overview';
import { WorkflowOverview } from '@/features/welcome/components/workflow-overview';
import { requireUser } from '@/app/guards';

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireUser(queryClient, request);
  return null;
};

/** The signed-in home page: the person's roles, what each lets them do, and how work flows. */
export function Component() {
  const { data: user } = useUser();
  if (!user) return null; // the shell redirects
  const firstName = user.name.split(/\s+/)[0] || user.name;
  return (
    <>
      <DocumentTitle>Home</DocumentTitle>
      <PageHeader
        title={`Welcome, ${firstName}`}
        subtitle="Scorecourt keeps each champion–challenger comparison as one governed record: the holdout, the evidence, the review and the decision."
      />
      <div className="grid gap-8 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-8">
          <section aria-labelledby="your-roles" className="space-y-3">
            <h2 id="your-roles" className="text-base font-semibold text-ink">
              {user.roles.length === 1 ? 'Your role' : 'Your roles'}
            </h2>
            <RoleOverview
              roles={user.roles}
              actions={{
                admin: (
                  <>
                    <ButtonLink to={paths.admin.people()} size="sm" variant="primary">
                      Manage people
                    </ButtonLink>
                    <ButtonLink to={paths.admin.outbox()} size="sm">
                      Read the outbox
                    </ButtonLink>
                  </>
                ),
                modeler: (
                  <>
                    <ButtonLink to={paths.comparisons.new()} size="sm" variant="primary">
                      Start a new comparison
                    </ButtonLink>
                    <ButtonLink to={paths.comparisons.list({ state: 'returned' })} size="sm">
                      Comparisons returned to modelers
                    </ButtonLink>
                  </>
                ),
                analyst: (
                  <ButtonLink to={paths.comparisons.list({ state: 'in-review' })} size="sm" variant="primary">
                    Comparisons in review
                  </ButtonLink>
                ),
                policy: (
                  <ButtonLink to={paths.comparisons.list()} size="sm" variant="primary">
                    Open the comparisons
                  </ButtonLink>
                ),
                committee: (
                  <ButtonLink to={paths.comparisons.list({ state: 'validated' })} size="sm" variant="primary">
                    Comparisons awaiting a decision
                  </ButtonLink>
                ),
              }}
            />
          </section>
          <Section title="Other roles" description="Ask an administrator if your work needs one of these.">
            <OtherRoles roles={user.roles} />
          </Section>
        </div>
        <div className="space-y-6">
          <Section title="How a comparison moves" description="Every signed-in person can read every comparison. Each step is recorded with who took it and when.">
            <WorkflowOverview roles={user.roles} />
          </Section>
          <Callout tone="caution" title="The verdict advises; the committee decides">
            <p>
              Statistical significance is not business approval. A new model changes who is approved and declined, so fair-lending and
              adverse-action duties apply. Follow your institution’s model risk policy, local regulation and licensed advice.
            </p>
          </Callout>
        </div>
      </div>
    </>
  );
}
