import { useState, type FormEvent } from 'react';
import type { Member, Role } from '@shared/schemas';
import { inviteInput } from '@shared/schemas/account';
import { QueryState } from '@/components/query-state';
import { useQueryClient } from '@tanstack/react-query';
import { meQuery, useMe } from '@/lib/auth/get-me';
import { useCan } from '@/lib/auth/can';
import { bannerText, ErrorBanner, fieldErrors, Notice, TextField, type FieldErrors } from '@/components/form-bits';
import { useChangeRole, useInvitations, useInvite, useRemoveMember, useRevokeInvitation, useTeam, useUpdateTeamSettings } from '../api/team';
import type { PhotoGps } from '@shared/schemas/team';
import { roles, roleTable } from '@shared/permissions';
import type { UnitSystem } from '@shared/schemas/common';

/** /team: the members and their roles; admins invite, change roles, remove, revoke. */
export function TeamPage() {
  const me = useMe();
  const team = useTeam();
  const manage = useCan()('team.manage');
  return (
    <div className="mx-auto max-w-3xl space-y-6">
      <h1 className="text-2xl font-bold">Team{team.data ? ` · ${team.data.team.name}` : ''}</h1>
      {manage && <InviteSection />}
      <section aria-labelledby="members">
        <h2 id="members" className="mb-2 text-xl font-bold">
          Members
        </h2>
        <QueryState query={team}>
          {(t) => (
            <ul className="space-y-2">
              {t.members.map((m) => (
                <MemberRow key={m.userId} member={m} manage={manage} isMe={m.userId === me.data?.user.id} />
              ))}
            </ul>
          )}
        </QueryState>
      </section>
      {manage && <PendingInvitations />}
      {manage && team.data && <WorkshopUnitsSetting value={team.data.team.unitSystem} />}
      {manage && team.data && <PhotoLocationSetting value={team.data.team.photoGps} />}
      <section aria-labelledby="roles" className="card">
        <h2 id="roles" className="mb-2 text-lg font-bold">
          Roles
        </h2>
        <dl className="space-y-1">
          {roles.map((r) => (
            <div key={r}>
              <dt className="inline font-bold">{r}: </dt>
              <dd className="inline">{roleTable[r].summary}</dd>
            </div>
          ))}
        </dl>
      </section>
    </div>
  );
}

function RoleSelect({ id, value, onChange, disabled, label }: { id: string; value: Role; onChange: (r: Role) => void; disabled?: boolean; label: string }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} value={value} disabled={disabled} onChange={(e) => onChange(e.target.value as Role)} className="input">
        {roles.map((r) => (
          <option key={r} value={r}>
            {r}
          </option>
        ))}
      </select>
    </div>
  );
}

function MemberRow({ member, manage, isMe }: { member: Member; manage: boolean; isMe: boolean }) {
  const changeRole = useChangeRole();
  const remove = useRemoveMember();
  const [confirming, setConfirming] = useState(false);
  // A role changes what a person may do at once: the admin confirms the change, then sees it saved.
  const [newRole, setNewRole] = useState<Role | null>(null);
  const [saved, setSaved] = useState<Role | null>(null);
  const error = changeRole.error ?? remove.error;
  return (
    <li className="card space-y-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <div>
          <p className="text-lg font-bold">
            {member.name}
            {isMe && ' (you)'}
          </p>
          <p className="break-all text-sm">{member.email}</p>
        </div>
        {!manage && <span className="rounded-lg bg-paper px-3 py-1 font-bold">{member.role}</span>}
      </div>
      {manage && (
        <div className="grid gap-2 sm:grid-cols-[1fr_auto] sm:items-end">
          <RoleSelect
            id={`role-${member.userId}`}
            label={`Role of ${member.name}`}
            value={newRole ?? member.role}
            disabled={changeRole.isPending}
            onChange={(role) => {
              setSaved(null);
              setNewRole(role === member.role ? null : role);
            }}
          />
          {confirming ? (
            <div className="flex gap-2">
              <button
                type="button"
                className="btn border-alert bg-alert text-paper"
                onClick={() => remove.mutate(member.userId, { onSettled: () => setConfirming(false) })}
              >
                Remove {member.name}
              </button>
              <button type="button" className="btn" onClick={() => setConfirming(false)}>
                Keep
              </button>
            </div>
          ) : (
            <button type="button" className="btn border-alert text-alert" onClick={() => setConfirming(true)}>
              Remove…
            </button>
          )}
        </div>
      )}
      {manage && newRole && (
        <div role="group" aria-label={`Confirm the role of ${member.name}`} className="flex flex-wrap items-center gap-2 rounded-lg bg-signal/20 p-2">
          <span>
            Change {member.name} from <b>{member.role}</b> to <b>{newRole}</b>? {roleTable[newRole].summary}
          </span>
          <button
            type="button"
            className="btn-primary"
            disabled={changeRole.isPending}
            onClick={() =>
              changeRole.mutate(
                { userId: member.userId, role: newRole },
                {
                  onSuccess: () => {
                    setSaved(newRole);
                    setNewRole(null);
                  },
                },
              )
            }
          >
            Change role
          </button>
          <button type="button" className="btn" onClick={() => setNewRole(null)}>
            Cancel
          </button>
        </div>
      )}
      {saved && (
        <p role="status" className="text-good">
          Saved: {member.name} is now {roleTable[saved].singular}.
        </p>
      )}
      <ErrorBanner>{error?.message}</ErrorBanner>
    </li>
  );
}

function InviteSection() {
  const invite = useInvite();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [role, setRole] = useState<Role>('tester');
  const [sentTo, setSentTo] = useState<string | null>(null);

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const formEl = e.currentTarget;
    const parsed = inviteInput.safeParse({ email: new FormData(formEl).get('email'), role });
    setSentTo(null);
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    invite.mutate(parsed.data, {
      onSuccess: (inv) => {
        formEl.reset();
        setSentTo(inv.email);
      },
      onError: (err) => setErrors(fieldErrors(err)),
    });
  }

  return (
    <section className="card space-y-3" aria-labelledby="invite">
      <h2 id="invite" className="text-xl font-bold">
        Invite someone
      </h2>
      <p className="text-sm">They get an e-mail with a link that works once, for 7 days, to choose their name and password.</p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <TextField label="E-mail address" name="email" type="email" autoComplete="off" error={errors.email} />
        <RoleSelect id="invite-role" label="Role" value={role} onChange={setRole} />
        <p className="text-sm">
          {role}: {roleTable[role].summary}
        </p>
        <ErrorBanner>{bannerText(invite.error, errors)}</ErrorBanner>
        {sentTo && <Notice>Invitation sent to {sentTo}.</Notice>}
        <button type="submit" className="btn-primary w-full" disabled={invite.isPending}>
          {invite.isPending ? 'Sending…' : 'Send invitation'}
        </button>
      </form>
    </section>
  );
}

function PendingInvitations() {
  const invitations = useInvitations(true);
  const revoke = useRevokeInvitation();
  return (
    <section aria-labelledby="pending">
      <h2 id="pending" className="mb-2 text-xl font-bold">
        Pending invitations
      </h2>
      <QueryState query={invitations}>
        {(list) =>
          list.length === 0 ? (
            <p>None.</p>
          ) : (
            <ul className="space-y-2">
              {list.map((i) => (
                <li key={i.id} className="card flex flex-wrap items-center justify-between gap-2">
                  <div>
                    <p className="break-all font-bold">{i.email}</p>
                    <p className="text-sm">
                      {i.role} · invited by {i.invitedByName || 'an admin'} · expires {new Date(i.expiresAt).toLocaleDateString()}
                    </p>
                  </div>
                  <button
                    type="button"
                    className="btn"
                    disabled={revoke.isPending}
                    onClick={() => revoke.mutate(i.id)}
                    aria-label={`Revoke the invitation of ${i.email}`}
                  >
                    Revoke
                  </button>
                </li>
              ))}
            </ul>
          )
        }
      </QueryState>
      <ErrorBanner>{revoke.error?.message}</ErrorBanner>
    </section>
  );
}

/** The units members see unless they chose their own (Account page): screens, sheets and CSV. */
function WorkshopUnitsSetting({ value }: { value: UnitSystem }) {
  const update = useUpdateTeamSettings();
  const qc = useQueryClient();
  return (
    <ChoiceSetting
      name="workshop-units"
      title="Workshop units"
      text="What everyone in the workshop sees and types, unless they chose their own units on their Account page. Everything is stored in millimetres."
      value={value}
      options={[
        { value: 'mm', label: 'Millimetres (mm)' },
        { value: 'in', label: 'Inches (in), to 0.01 in on screen; sheets also to the nearest 1/16 in' },
      ]}
      // Members without their own choice see the new units at once: their identity carries the workshop's.
      choose={(unitSystem) => update.mutate({ unitSystem }, { onSuccess: () => qc.invalidateQueries({ queryKey: meQuery().queryKey }) })}
      update={update}
      saved={`Saved: the workshop now works in ${value === 'in' ? 'inches' : 'millimetres'}.`}
    />
  );
}

/** Whether photos keep where they were taken (GPS from the camera) or lose it at upload. */
function PhotoLocationSetting({ value }: { value: PhotoGps }) {
  const update = useUpdateTeamSettings();
  return (
    <ChoiceSetting
      name="photo-gps"
      title="Photo locations"
      text="Phone cameras record where a photo was taken. Twistlog never keeps it in the photo files it stores; this decides whether the position is kept beside the photo for the workshop to see."
      value={value}
      options={[
        { value: 'drop', label: 'Drop the location of every photo (also erases locations kept so far)' },
        { value: 'keep', label: 'Keep the location of photos uploaded from now on' },
      ]}
      choose={(photoGps) => update.mutate({ photoGps })}
      update={update}
    />
  );
}

/** One workshop setting as a card of radio choices, saved as soon as another one is picked. */
function ChoiceSetting<V extends string>(props: {
  name: string;
  title: string;
  text: string;
  value: V;
  options: { value: V; label: string }[];
  choose: (value: V) => void;
  update: { isPending: boolean; isSuccess: boolean; error: Error | null };
  /** Said once the change is saved; nothing is said when left out. */
  saved?: string;
}) {
  const { update } = props;
  return (
    <section className="card space-y-2" aria-labelledby={props.name}>
      <h2 id={props.name} className="text-xl font-bold">
        {props.title}
      </h2>
      <p className="text-sm">{props.text}</p>
      <fieldset className="space-y-2" disabled={update.isPending}>
        <legend className="sr-only">{props.title}</legend>
        {props.options.map((o) => (
          <label key={o.value} className="flex min-h-12 items-center gap-3">
            <input
              type="radio"
              name={props.name}
              checked={props.value === o.value}
              onChange={() => o.value !== props.value && props.choose(o.value)}
              className="h-6 w-6"
            />
            <span>{o.label}</span>
          </label>
        ))}
      </fieldset>
      {props.saved && update.isSuccess && <p role="status">{props.saved}</p>}
      <ErrorBanner>{update.error?.message}</ErrorBanner>
    </section>
  );
}
