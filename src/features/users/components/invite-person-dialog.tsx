import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { errorCodes } from '@shared/errors';
import { roleLabels, roles } from '@shared/roles';
import { type User, inviteInputSchema } from '@shared/users';
import { ApiError, errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Checkbox, CheckboxGroup } from '@/components/checkbox';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/text-field';
import { useInviteUser } from '@/features/users/api/invite-user';
import { roleGuide } from '@/config/role-guide';

/** Invites a person by e-mail with one or more roles; the e-mail carries a link to set a password. */
export function InvitePersonDialog({ open, onClose, onInvited }: { open: boolean; onClose: () => void; onInvited: (user: User) => void }) {
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Invite a person"
      description="They get an e-mail with a one-time link to choose a password. Until then their account is inactive."
    >
      <InviteForm onClose={onClose} onInvited={onInvited} />
    </Dialog>
  );
}

function InviteForm({ onClose, onInvited }: { onClose: () => void; onInvited: (user: User) => void }) {
  const invite = useInviteUser();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(inviteInputSchema), defaultValues: { name: '', email: '', roles: [] } });

  const onSubmit = handleSubmit((values) =>
    invite.mutate(values, {
      onSuccess: (user) => onInvited(user),
      onError: (error) => {
        if (error instanceof ApiError && error.status === 409) setError('email', { type: 'server', message: error.message });
        else applyServerFieldErrors(error, setError, ['name', 'email', 'roles']);
      },
    }),
  );

  const conflictShown = invite.error instanceof ApiError && (invite.error.status === 409 || invite.error.code === errorCodes.validation);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {invite.isError && !conflictShown ? (
        <Alert tone="error" title="The invitation was not sent">
          <p>{errorMessage(invite.error)}</p>
        </Alert>
      ) : null}
      <TextField label="Full name" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <TextField label="E-mail address" type="email" autoComplete="off" spellCheck={false} error={errors.email?.message} {...register('email')} />
      <CheckboxGroup legend="Roles" hint="Choose at least one. A person may hold several." error={errors.roles?.message}>
        {roles.map((role) => (
          <Checkbox key={role} value={role} label={roleLabels[role]} hint={roleGuide[role].summary} {...register('roles')} />
        ))}
      </CheckboxGroup>
      <div className="flex justify-end gap-2 border-t border-line pt-4">
        <Button onClick={onClose} disabled={invite.isPending}>
          Cancel
        </Button>
        <Button type="submit" variant="primary" loading={invite.isPending} loadingText="Sending…">
          Send invitation
        </Button>
      </div>
    </form>
  );
}
