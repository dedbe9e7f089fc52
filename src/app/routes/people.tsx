import { useQuery } from '@tanstack/react-query';
import { meOptions } from '@/features/auth/api/auth.queries';
import { AddPersonForm } from '@/features/people/components/add-person-form';
import { InvitePersonForm } from '@/features/people/components/invite-person-form';
import { PeopleTable } from '@/features/people/components/people-table';

export function PeopleRoute() {
  const me = useQuery(meOptions());
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-display text-ink-900">People</h1>
        <p className="mt-1 text-body text-ink-500">
          Accounts of the lab. Invite people by e-mail: they choose their own password from the link. A deactivated person is
          signed out at once and cannot sign in until reactivated.
        </p>
      </div>
      <div className="grid items-start gap-6 lg:grid-cols-[1fr_20rem]">
        <PeopleTable currentUserId={me.data?.id} />
        <div className="space-y-6">
          <InvitePersonForm />
          <AddPersonForm />
        </div>
      </div>
    </div>
  );
}
