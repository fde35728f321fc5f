import type { User } from '#shared/schemas/users.ts';
import { Card } from '../../../components/ui/card.tsx';
import { Checkbox } from '../../../components/ui/checkbox.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { useUpdateMe } from '../api/update-me.ts';

/** "Your nightly e-mail": every signed-in person subscribes to the digest, or leaves it, for themselves. */
export function DigestSubscription({ user }: { user: User }) {
  const update = useUpdateMe();
  const checked = update.isPending ? Boolean(update.variables?.digest) : user.digest;
  return (
    <Card title="Your nightly e-mail" description={`Sent to ${user.email} after each nightly run.`}>
      <Checkbox
        label="Send me the nightly digest"
        hint="The figures of yesterday and the last 7 days that your role may read, what changed since the last digest, and alert mails (a membrane threshold first crossed; a nightly import that failed, for those who handle imports)."
        checked={checked}
        disabled={update.isPending}
        onChange={(e) =>
          update.mutate(
            { digest: e.target.checked },
            { onSuccess: (u) => showToast({ tone: 'success', title: u.digest ? 'Subscribed' : 'Unsubscribed', message: u.digest ? 'The next nightly digest comes to you.' : 'You get no more nightly mail.' }) },
          )
        }
      />
    </Card>
  );
}
