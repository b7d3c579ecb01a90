import { useMemo, useState } from 'react';
import { Icon } from '@/components/ui/Icon';
import { api, ApiError } from '@/lib/api.client';
import { ROLE_LABELS, STATUS_LABELS, personStatus, type PeopleChoices, type PersonRow, type PersonStatus } from '@/lib/accounts/people';
import { formatMoment, formatMomentAbsolute, relativeHint } from '@/lib/moment-text';
import { ROLES, type Role } from '@/lib/permissions';
import type { IconName } from '@/lib/icons';
import { InviteDialog, EditPersonDialog, type Flash } from './PersonDialogs';

export interface PeopleAdminProps {
  initialPeople: PersonRow[];
  choices: PeopleChoices;
  currentUserId: number;
  timeZone: string;
  /** When the server rendered the page (ISO): relative hints count from it, so server and browser agree. */
  renderedAt: string;
}

const STATUS_LOOK: Record<PersonStatus, { icon: IconName; className: string }> = {
  active: { icon: 'check', className: 'text-moss' },
  invited: { icon: 'mail', className: 'text-harbour' },
  invite_lapsed: { icon: 'alert', className: 'bg-ochre-tint text-ink rounded px-1.5' },
  deactivated: { icon: 'retired', className: 'text-ink-soft' },
};

export function StatusBadge({ person, now }: { person: PersonRow; now: Date }) {
  const status = personStatus(person, now);
  const look = STATUS_LOOK[status];
  return (
    <span className={`inline-flex items-center gap-1.5 font-medium ${look.className}`} data-status={status}>
      <Icon name={look.icon} size={18} />
      {STATUS_LABELS[status]}
    </span>
  );
}

function FlashNotice({ flash, onDismiss }: { flash: Flash; onDismiss: () => void }) {
  const tone = { good: 'notice-good', attention: 'notice-attention', fault: 'notice-fault' }[flash.tone];
  return (
    <div className={`${tone} mt-4 flex items-start justify-between gap-4`} role="status" id="people-flash">
      <span>{flash.text}</span>
      <button type="button" className="underline shrink-0" onClick={onDismiss}>
        Dismiss
      </button>
    </div>
  );
}

export default function PeopleAdmin({ initialPeople, choices, currentUserId, timeZone, renderedAt }: PeopleAdminProps) {
  const [people, setPeople] = useState(initialPeople);
  const [query, setQuery] = useState('');
  const [roleFilter, setRoleFilter] = useState<Role | ''>('');
  const [showDeactivated, setShowDeactivated] = useState(false);
  const [dialog, setDialog] = useState<{ kind: 'invite' } | { kind: 'edit'; id: number } | null>(null);
  const [flash, setFlash] = useState<Flash | null>(null);
  const now = useMemo(() => new Date(renderedAt), [renderedAt]);

  const visible = useMemo(() => {
    const q = query.trim().toLowerCase();
    return people.filter(
      (p) =>
        (showDeactivated || p.active) &&
        (!roleFilter || p.role === roleFilter) &&
        (!q || `${p.name} ${p.email} ${p.organisationName} ${p.homeSiteName ?? ''}`.toLowerCase().includes(q)),
    );
  }, [people, query, roleFilter, showDeactivated]);
  const deactivatedCount = people.filter((p) => !p.active).length;

  function upsert(person: PersonRow) {
    setPeople((list) => (list.some((p) => p.id === person.id) ? list.map((p) => (p.id === person.id ? person : p)) : [...list, person]));
  }
  async function reload() {
    try {
      const { people: fresh } = await api.get<{ people: PersonRow[] }>('/api/admin/users');
      setPeople(fresh);
    } catch (err) {
      setFlash({ tone: 'fault', text: err instanceof ApiError ? err.message : 'The list could not be reloaded.' });
    }
  }
  const lastSignIn = (p: PersonRow) => (p.lastSignInAt ? formatMoment(p.lastSignInAt, timeZone, now) : 'Never');
  const editing = dialog?.kind === 'edit' ? people.find((p) => p.id === dialog.id) : undefined;

  return (
    <div>
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1>People</h1>
          <p className="mt-1 text-ink-soft">Everyone who signs in: the operator's staff and the customers' users.</p>
        </div>
        <button type="button" className="btn-primary" id="invite-open" onClick={() => setDialog({ kind: 'invite' })}>
          <Icon name="mail" /> Invite someone
        </button>
      </div>

      {flash && <FlashNotice flash={flash} onDismiss={() => setFlash(null)} />}

      <div className="mt-6 flex flex-wrap items-end gap-3" role="search">
        <div className="min-w-[14rem] flex-1">
          <label className="label" htmlFor="people-search">
            Find
          </label>
          <input id="people-search" className="field" type="search" placeholder="Name, e-mail, organisation or depot" value={query} onChange={(e) => setQuery(e.target.value)} />
        </div>
        <div>
          <label className="label" htmlFor="people-role">
            Role
          </label>
          <select id="people-role" className="field" value={roleFilter} onChange={(e) => setRoleFilter(e.target.value as Role | '')}>
            <option value="">All roles</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        </div>
        <label className="flex min-h-touch items-center gap-2 text-sm">
          <input type="checkbox" className="h-5 w-5 accent-kelp" checked={showDeactivated} onChange={(e) => setShowDeactivated(e.target.checked)} />
          Show deactivated ({deactivatedCount})
        </label>
      </div>

      <p className="mt-4 text-sm text-ink-soft" aria-live="polite">
        {visible.length} of {people.length} {people.length === 1 ? 'person' : 'people'}
      </p>

      {visible.length === 0 ? (
        <div className="card mt-2 p-6 text-ink-soft">
          Nobody matches. Clear the search{!showDeactivated && deactivatedCount > 0 ? ', show deactivated people' : ''}, or invite someone.
        </div>
      ) : (
        <>
          {/* Desktop: a table */}
          <div className="card mt-2 hidden overflow-x-auto md:block" tabIndex={0} role="region" aria-label="People (the table scrolls sideways)">
            <table className="table-pin w-full text-left text-sm" id="people-table">
              <thead className="border-b border-paper-line bg-paper text-ink-soft">
                <tr>
                  <th scope="col" className="px-4 py-2 font-medium">
                    Person
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Role
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Organisation · home depot
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Status
                  </th>
                  <th scope="col" className="px-3 py-2 font-medium">
                    Last sign-in
                  </th>
                  <th scope="col" className="px-3 py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
                {visible.map((p) => (
                  <tr key={p.id} data-person={p.email} className={p.active ? '' : 'bg-paper/60'}>
                    <td className="px-4 py-3">
                      <div className="font-medium text-ink">
                        {p.name}
                        {p.id === currentUserId && <span className="ml-2 text-xs text-ink-soft">(you)</span>}
                      </div>
                      <div className="text-ink-soft break-all">{p.email}</div>
                    </td>
                    <td className="px-3 py-3">
                      <div>{ROLE_LABELS[p.role]}</div>
                      {p.qualifiedInspector && (
                        <div className="inline-flex items-center gap-1 text-ink-soft">
                          <Icon name="check" size={16} /> Qualified inspector
                        </div>
                      )}
                    </td>
                    <td className="px-3 py-3">
                      <div>{p.organisationName}</div>
                      {p.homeSiteName && <div className="text-ink-soft">{p.homeSiteName}</div>}
                    </td>
                    <td className="px-3 py-3 whitespace-nowrap">
                      <StatusBadge person={p} now={now} />
                    </td>
                    <td className="px-3 py-3 num">
                      {p.lastSignInAt ? (
                        <>
                          <div className="whitespace-nowrap">{formatMomentAbsolute(p.lastSignInAt, timeZone)}</div>
                          <div className="text-ink-soft">{relativeHint(p.lastSignInAt, now)}</div>
                        </>
                      ) : (
                        <span className="text-ink-soft">Never</span>
                      )}
                    </td>
                    <td className="px-3 py-3 text-right">
                      <button type="button" className="btn-quiet min-h-0 h-9 px-3 text-sm" onClick={() => setDialog({ kind: 'edit', id: p.id })} aria-label={`Change ${p.name}`}>
                        Change
                      </button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>

          {/* Phone: one card per person */}
          <ul className="mt-2 space-y-3 md:hidden">
            {visible.map((p) => (
              <li key={p.id} className="card p-4" data-person={p.email}>
                <div className="flex items-start justify-between gap-3">
                  <div className="min-w-0">
                    <div className="font-medium">
                      {p.name}
                      {p.id === currentUserId && <span className="ml-2 text-xs text-ink-soft">(you)</span>}
                    </div>
                    <div className="truncate text-sm text-ink-soft">{p.email}</div>
                  </div>
                  <StatusBadge person={p} now={now} />
                </div>
                <dl className="mt-3 grid grid-cols-[7rem_1fr] gap-x-3 gap-y-1 text-sm">
                  <dt className="text-ink-soft">Role</dt>
                  <dd>{ROLE_LABELS[p.role]}</dd>
                  <dt className="text-ink-soft">Organisation</dt>
                  <dd>{p.organisationName}</dd>
                  {p.homeSiteName && (
                    <>
                      <dt className="text-ink-soft">Home depot</dt>
                      <dd>{p.homeSiteName}</dd>
                    </>
                  )}
                  {p.qualifiedInspector && (
                    <>
                      <dt className="text-ink-soft">Inspector</dt>
                      <dd>Qualified</dd>
                    </>
                  )}
                  <dt className="text-ink-soft">Last sign-in</dt>
                  <dd className="num">{lastSignIn(p)}</dd>
                </dl>
                <button type="button" className="btn-quiet mt-3 w-full" onClick={() => setDialog({ kind: 'edit', id: p.id })} aria-label={`Change ${p.name}`}>
                  Change
                </button>
              </li>
            ))}
          </ul>
        </>
      )}

      {dialog?.kind === 'invite' && (
        <InviteDialog
          choices={choices}
          timeZone={timeZone}
          onClose={() => setDialog(null)}
          onInvited={(person, f) => {
            upsert(person);
            setFlash(f);
            setDialog(null);
          }}
        />
      )}
      {editing && (
        <EditPersonDialog
          person={editing}
          choices={choices}
          isSelf={editing.id === currentUserId}
          now={now}
          timeZone={timeZone}
          onClose={() => setDialog(null)}
          onReload={reload}
          onSaved={(person, f) => {
            upsert(person);
            setFlash(f);
            setDialog(null);
          }}
        />
      )}
    </div>
  );
}
