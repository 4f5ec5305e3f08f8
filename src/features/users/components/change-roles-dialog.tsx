import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import { roleLabels, roles } from '@shared/roles';
import { type User, inviteInputSchema } from '@shared/users';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert, Callout } from '@/components/callout';
import { Checkbox, CheckboxGroup } from '@/components/checkbox';
import { Dialog } from '@/components/dialog';
import { useUpdateUser } from '@/features/users/api/update-user';
import { roleGuide } from '@/config/role-guide';

const rolesSchema = inviteInputSchema.pick({ roles: true });

type ChangeRolesDialogProps = {
  /** The person whose roles change; null when closed. */
  user: User | null;
  currentUserId: number;
  onClose: () => void;
  onSaved: (user: User) => void;
};

export function ChangeRolesDialog({ user, currentUserId, onClose, onSaved }: ChangeRolesDialogProps) {
  return (
    <Dialog open={user !== null} onClose={onClose} title={user ? `Roles of ${user.name}` : 'Roles'} description={user?.email}>
      {user ? <RolesForm user={user} self={user.id === currentUserId} onClose={onClose} onSaved={onSaved} /> : null}
    </Dialog>
  );
}

function RolesForm({ user, self, onClose, onSaved }: { user: User; self: boolean; onClose: () => void; onSaved: (user: User) => void }) {
  const update = useUpdateUser();
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors, isDirty },
  } = useForm({ resolver: zodResolver(rolesSchema), defaultValues: { roles: [...user.roles] } });
  const chosen = useWatch({ control, name: 'roles' });
  const losingAdmin = self && user.roles.includes('admin') && !chosen.includes('admin');

  const onSubmit = handleSubmit((values) =>
    update.mutate(
      { id: user.id, input: { roles: values.roles } },
      { onSuccess: onSaved, onError: (error) => applyServerFieldErrors(error, setError, ['roles']) },
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {update.isError ? (
        <Alert tone="error" title="The roles were not changed">
          <p>{errorMessage(update.error)}</p>
        </Alert>
      ) : null}
      <CheckboxGroup legend="Roles" hint="A person may hold several. The change applies from their next page." error={errors.roles?.message}>
        {roles.map((role) => (
          <Checkbox key={role} value={role} label={roleLabels[role]} hint={roleGuide[role].summary} {...register('roles')} />
        ))}
      </CheckboxGroup>
      {losingAdmin ? (
        <Callout tone="caution" title="You are removing your own Administrator role">
          <p>You will no longer be able to open People, the outbox or the adoption policy.</p>
        </Callout>
      ) : null}
      <div className="flex justify-end gap-2 border-t border-line pt-4">
        <Button onClick={onClose} disabled={update.isPending}>
          Cancel
        </Button>
        <Button type="submit" variant="primary" disabled={!isDirty} loading={update.isPending} loadingText="Saving…">
          Save roles
        </Button>
      </div>
    </form>
  );
}
