import { Link } from 'react-router';
import { paths } from '@/config/paths';
import { DocumentTitle } from '@/components/document-title';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { AuthLayout } from '@/app/layouts/auth-layout';

export function Component() {
  return (
    <AuthLayout title="Reset your password" subtitle="We will e-mail you a one-time link to choose a new password.">
      <DocumentTitle>Reset your password</DocumentTitle>
      <ForgotPasswordForm />
      <p className="mt-6 text-sm">
        <Link to={paths.auth.signIn()} className="font-medium text-court-700 underline hover:text-court-900">
          Back to sign-in
        </Link>
      </p>
    </AuthLayout>
  );
}
