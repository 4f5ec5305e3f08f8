import { type User } from '@shared/users';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Dialog } from '@/components/dialog';
import { useUpdateUser } from '@/features/users/api/update-user';

type SetActiveDialogProps = {
  /** The person to deactivate (if active) or reactivate (if not); null when closed. */
  user: User | null;
  onClose: () => void;
  onSaved: (user: User) => void;
};

/** Confirms deactivating (which ends the person's sessions) or reactivating an account. */
export function SetActiveDialog({ user, onClose, onSaved }: SetActiveDialogProps) {
  const update = useUpdateUser();
  const deactivate = user?.active ?? false;
  const close = () => {
    update.reset();
    onClose();
  };
  return (
    <Dialog
      open={user !== null}
      onClose={close}
      busy={update.isPending}
      size="sm"
      title={user ? `${deactivate ? 'Deactivate' : 'Reactivate'} ${user.name}?` : ''}
      footer={
        user ? (
          <>
            <Button onClick={close} disabled={update.isPending}>
              Cancel
            </Button>
            <Button
              variant={deactivate ? 'danger' : 'primary'}
              loading={update.isPending}
              loadingText="Saving…"
              onClick={() =>
                update.mutate(
                  { id: user.id, input: { active: !deactivate } },
                  {
                    onSuccess: (saved) => {
                      update.reset();
                      onSaved(saved);
                    },
                  },
                )
              }
            >
              {deactivate ? 'Deactivate' : 'Reactivate'}
            </Button>
          </>
        ) : null
      }
    >
      {user ? (
        <div className="space-y-3 text-sm">
          {update.isError ? (
            <Alert tone="error" title="Nothing was changed">
              <p>{errorMessage(update.error)}</p>
            </Alert>
          ) : null}
          {deactivate ? (
            <p>
              {user.name} ({user.email}) will be signed out everywhere and cannot sign in until an administrator reactivates the account. Their
              comparisons, notes and votes stay in the record.
            </p>
          ) : (
            <p>
              {user.name} ({user.email}) will be able to sign in again with their roles. If they never set a password, they can ask for a reset
              link from the sign-in page.
            </p>
          )}
        </div>
      ) : null}
    </Dialog>
  );
}
