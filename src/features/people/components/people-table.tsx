import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { roleLabels, roles, type Role } from '@shared/domain/roles';
import type { User } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Badge, EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { useInvitePerson, useUpdatePerson } from '../api/people.mutations';
import { peopleListOptions } from '../api/people.queries';

const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** Status of an account that has no password yet: the invitation is open, or its link expired. */
function InvitationStatus({ person }: { person: User }) {
  const open = person.invitationExpiresAt !== null && Date.parse(person.invitationExpiresAt) > Date.now();
  return open ? (
    <div>
      <Badge tone="caution">Invited</Badge>
      <div className="mt-1 text-caption text-ink-500">link valid until {dateTime.format(new Date(person.invitationExpiresAt!))}</div>
    </div>
  ) : (
    <div>
      <Badge tone="fault">Invitation expired</Badge>
      <div className="mt-1 text-caption text-ink-500">send it again for a new link</div>
    </div>
  );
}

/** Send a pending invitee a new link (the older ones stop working). */
function SendAgain({ person }: { person: User }) {
  const invite = useInvitePerson();
  return (
    <div className="flex flex-col items-end gap-1">
      <Button
        variant="secondary"
        className="!px-2.5 !py-1"
        disabled={invite.isPending}
        onClick={() => invite.mutate({ email: person.email, name: person.name, role: person.role })}
      >
        {invite.isPending ? 'Sending…' : 'Send invitation again'}
      </Button>
      {invite.isSuccess ? <span className="text-caption text-pass-700">New link sent</span> : null}
      {invite.error ? <span className="text-caption text-fault-700">{invite.error.message}</span> : null}
    </div>
  );
}

function PersonRow({ person, isSelf }: { person: User; isSelf: boolean }) {
  const update = useUpdatePerson();
  const [confirming, setConfirming] = useState(false);
  return (
    <tr className={`border-t border-ink-100 align-top ${person.active ? '' : 'bg-ptfe-100 text-ink-400'}`}>
      <td className="py-2.5 pr-3">
        <div className="font-semibold text-ink-800">
          {person.name} {isSelf ? <span className="text-caption font-normal text-ink-400">(you)</span> : null}
        </div>
        <div className="text-caption text-ink-500">{person.email}</div>
        {update.error ? (
          <div className="mt-1.5">
            <Notice tone="fault">{update.error.message}</Notice>
          </div>
        ) : null}
      </td>
      <td className="py-2.5 pr-3">
        <label className="sr-only" htmlFor={`role-${person.id}`}>
          Role of {person.name}
        </label>
        <select
          id={`role-${person.id}`}
          value={person.role}
          disabled={update.isPending}
          onChange={(e) => update.mutate({ id: person.id, changes: { role: e.target.value as Role } })}
          className="rounded-chip border border-ink-200 bg-white px-2 py-1 text-body"
        >
          {roles.map((role) => (
            <option key={role} value={role}>
              {roleLabels[role]}
            </option>
          ))}
        </select>
      </td>
      <td className="py-2.5 pr-3">
        {!person.active ? <Badge tone="muted">Deactivated</Badge> : person.invited ? <InvitationStatus person={person} /> : <Badge tone="pass">Active</Badge>}
      </td>
      <td className="py-2.5 pr-3 text-caption text-ink-500">
        {person.lastSignInAt ? dateTime.format(new Date(person.lastSignInAt)) : 'never'}
      </td>
      <td className="py-2.5 text-right">
        <div className="flex flex-col items-end gap-1.5">
          {person.active && person.invited ? <SendAgain person={person} /> : null}
          {person.active ? (
            confirming ? (
              <div className="flex justify-end gap-1.5">
                <Button
                  variant="danger"
                  className="!px-2.5 !py-1"
                  disabled={update.isPending}
                  onClick={() => update.mutate({ id: person.id, changes: { active: false } }, { onSettled: () => setConfirming(false) })}
                >
                  Sign out and deactivate
                </Button>
                <Button variant="quiet" className="!px-2.5 !py-1" onClick={() => setConfirming(false)}>
                  Keep
                </Button>
              </div>
            ) : (
              <Button variant="secondary" className="!px-2.5 !py-1" onClick={() => setConfirming(true)}>
                Deactivate…
              </Button>
            )
          ) : (
            <Button
              variant="secondary"
              className="!px-2.5 !py-1"
              disabled={update.isPending}
              onClick={() => update.mutate({ id: person.id, changes: { active: true } })}
            >
              Reactivate
            </Button>
          )}
        </div>
      </td>
    </tr>
  );
}

/** All accounts; `currentUserId` marks the manager's own row. */
export function PeopleTable({ currentUserId }: { currentUserId: number | undefined }) {
  const people = useQuery(peopleListOptions());
  if (people.isPending) return <Loading label="Loading people…" />;
  if (people.isError) return <Notice tone="fault">{people.error.message}</Notice>;
  if (!people.data.length) return <EmptyState title="No accounts yet" />;
  return (
    <Panel>
      <table className="w-full text-left text-body">
        <caption className="sr-only">Accounts of the lab</caption>
        <thead>
          <tr className="text-caption uppercase tracking-wide text-ink-500">
            <th scope="col" className="pb-2 pr-3 font-semibold">Person</th>
            <th scope="col" className="pb-2 pr-3 font-semibold">Role</th>
            <th scope="col" className="pb-2 pr-3 font-semibold">Status</th>
            <th scope="col" className="pb-2 pr-3 font-semibold">Last sign-in</th>
            <th scope="col" className="pb-2 text-right font-semibold"><span className="sr-only">Actions</span></th>
          </tr>
        </thead>
        <tbody>
          {people.data.map((person) => (
            <PersonRow key={person.id} person={person} isSelf={person.id === currentUserId} />
          ))}
        </tbody>
      </table>
    </Panel>
  );
}
