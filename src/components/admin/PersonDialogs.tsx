import { useState, type FormEvent } from 'react';
import { Dialog, FieldProblem } from '@/components/ui/Dialog';
import { api, ApiError } from '@/lib/api.client';
import { ROLE_LABELS, isStaffRole, type PeopleChoices, type PersonRow } from '@/lib/accounts/people';
import { ROLES, type Role } from '@/lib/permissions';
import { formatMomentAbsolute } from '@/lib/moment-text';

export interface Flash {
  tone: 'good' | 'attention' | 'fault';
  text: string;
}

interface MailOutcome {
  status: 'sent' | 'failed';
  error: string | null;
}

const STAFF_ROLES = ROLES.filter(isStaffRole);

function mailFlash(person: PersonRow, mail: MailOutcome, what: string, timeZone: string): Flash {
  if (mail.status === 'sent') {
    const until = person.inviteExpiresAt ? ` The link works until ${formatMomentAbsolute(person.inviteExpiresAt, timeZone)}.` : '';
    return { tone: 'good', text: `${what} sent to ${person.email}.${until}` };
  }
  return {
    tone: 'attention',
    text: `${person.name} is on the list, but the e-mail could not be sent (${mail.error ?? 'unknown error'}). Check the mail set-up, then use “Resend invitation”.`,
  };
}

function problemText(err: unknown): string {
  if (err instanceof ApiError && err.code === 'validation_failed' && Object.keys(err.fieldMessages()).some((k) => k !== '')) {
    return 'Check the fields marked below.';
  }
  return err instanceof ApiError ? err.message : 'Something went wrong. Try again.';
}

/** Depot choice plus the inspector flag: only operator staff have them. */
function StaffFields({
  role,
  homeSiteId,
  setHomeSiteId,
  inspector,
  setInspector,
  choices,
  problems,
  idPrefix,
}: {
  role: Role;
  homeSiteId: number | null;
  setHomeSiteId: (v: number | null) => void;
  inspector: boolean;
  setInspector: (v: boolean) => void;
  choices: PeopleChoices;
  problems: Record<string, string>;
  idPrefix: string;
}) {
  if (!isStaffRole(role)) return null;
  return (
    <>
      <div>
        <label className="label" htmlFor={`${idPrefix}-depot`}>
          Home depot{role === 'yard' ? ' (required for yard staff)' : ' (optional)'}
        </label>
        <select
          id={`${idPrefix}-depot`}
          className="field"
          value={homeSiteId ?? ''}
          onChange={(e) => setHomeSiteId(e.target.value ? Number(e.target.value) : null)}
          aria-invalid={Boolean(problems.homeSiteId)}
          aria-describedby={`${idPrefix}-depot-problem`}
        >
          <option value="">— none —</option>
          {choices.depots.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name} ({d.code})
            </option>
          ))}
        </select>
        <FieldProblem id={`${idPrefix}-depot-problem`} message={problems.homeSiteId} />
      </div>
      <label className="flex min-h-touch items-start gap-3 text-sm">
        <input type="checkbox" className="mt-0.5 h-5 w-5 accent-kelp" checked={inspector} onChange={(e) => setInspector(e.target.checked)} id={`${idPrefix}-inspector`} />
        <span>
          <span className="font-medium">Qualified inspector</span>
          <span className="block text-ink-soft">May record periodic inspections and tests of bins.</span>
        </span>
      </label>
      <FieldProblem id={`${idPrefix}-inspector-problem`} message={problems.qualifiedInspector} />
    </>
  );
}

export function InviteDialog({
  choices,
  timeZone,
  onClose,
  onInvited,
}: {
  choices: PeopleChoices;
  timeZone: string;
  onClose: () => void;
  onInvited: (p: PersonRow, f: Flash) => void;
}) {
  const [name, setName] = useState('');
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('yard');
  const [customerId, setCustomerId] = useState<number | null>(null);
  const [homeSiteId, setHomeSiteId] = useState<number | null>(null);
  const [inspector, setInspector] = useState(false);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const staff = isStaffRole(role);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    setProblems({});
    try {
      const res = await api.post<{ person: PersonRow; mail: MailOutcome }>('/api/admin/users', {
        name,
        email,
        role,
        organisationId: staff ? choices.operator.id : (customerId ?? 0),
        homeSiteId: staff ? homeSiteId : null,
        qualifiedInspector: staff ? inspector : false,
      });
      onInvited(res.person, mailFlash(res.person, res.mail, 'Invitation', timeZone));
    } catch (err) {
      if (err instanceof ApiError) setProblems(err.fieldMessages());
      setError(problemText(err));
      setBusy(false);
    }
  }

  return (
    <Dialog title="Invite someone" labelId="invite-title" onClose={onClose}>
      <form className="space-y-4" onSubmit={submit} noValidate id="invite-form">
        <p className="text-sm text-ink-soft">They get an e-mail with a link to choose their password. The link works once, for 7 days.</p>
        {error && (
          <p className="notice-fault" role="alert">
            {error}
          </p>
        )}
        <div>
          <label className="label" htmlFor="invite-name">
            Name
          </label>
          <input
            id="invite-name"
            className="field"
            value={name}
            onChange={(e) => setName(e.target.value)}
            autoComplete="off"
            required
            maxLength={160}
            aria-invalid={Boolean(problems.name)}
            aria-describedby="invite-name-problem"
          />
          <FieldProblem id="invite-name-problem" message={problems.name} />
        </div>
        <div>
          <label className="label" htmlFor="invite-email">
            E-mail
          </label>
          <input
            id="invite-email"
            className="field"
            type="email"
            value={email}
            onChange={(e) => setEmail(e.target.value)}
            autoComplete="off"
            required
            maxLength={254}
            aria-invalid={Boolean(problems.email)}
            aria-describedby="invite-email-problem"
          />
          <FieldProblem id="invite-email-problem" message={problems.email} />
        </div>
        <div>
          <label className="label" htmlFor="invite-role">
            Role
          </label>
          <select id="invite-role" className="field" value={role} onChange={(e) => setRole(e.target.value as Role)}>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        </div>
        {staff ? (
          <p className="text-sm">
            <span className="text-ink-soft">Organisation:</span> {choices.operator.name} <span className="text-ink-soft">(staff belong to the operator)</span>
          </p>
        ) : (
          <div>
            <label className="label" htmlFor="invite-org">
              Customer organisation
            </label>
            <select
              id="invite-org"
              className="field"
              value={customerId ?? ''}
              onChange={(e) => setCustomerId(e.target.value ? Number(e.target.value) : null)}
              aria-invalid={Boolean(problems.organisationId)}
              aria-describedby="invite-org-problem"
            >
              <option value="">Choose…</option>
              {choices.customers.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </select>
            <FieldProblem id="invite-org-problem" message={problems.organisationId} />
          </div>
        )}
        <StaffFields
          role={role}
          homeSiteId={homeSiteId}
          setHomeSiteId={setHomeSiteId}
          inspector={inspector}
          setInspector={setInspector}
          choices={choices}
          problems={problems}
          idPrefix="invite"
        />
        <div className="flex flex-wrap justify-end gap-3 pt-2">
          <button type="button" className="btn-quiet" onClick={onClose}>
            Cancel
          </button>
          <button type="submit" className="btn-primary" disabled={busy} id="invite-submit">
            {busy ? 'Sending…' : 'Send invitation'}
          </button>
        </div>
      </form>
    </Dialog>
  );
}

export function EditPersonDialog({
  person,
  choices,
  isSelf,
  now,
  timeZone,
  onClose,
  onSaved,
  onReload,
}: {
  person: PersonRow;
  choices: PeopleChoices;
  isSelf: boolean;
  now: Date;
  timeZone: string;
  onClose: () => void;
  onSaved: (p: PersonRow, f: Flash) => void;
  onReload: () => Promise<void>;
}) {
  const [role, setRole] = useState<Role>(person.role);
  const [homeSiteId, setHomeSiteId] = useState<number | null>(person.homeSiteId);
  const [inspector, setInspector] = useState(person.qualifiedInspector);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [error, setError] = useState<{ text: string; stale: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const [confirming, setConfirming] = useState(false);
  const staff = isStaffRole(person.role);
  const pendingInvite = person.active && !person.hasPassword;

  async function patch(body: Record<string, unknown>, done: (p: PersonRow) => Flash) {
    setBusy(true);
    setError(null);
    setProblems({});
    try {
      const { person: saved } = await api.patch<{ person: PersonRow }>(`/api/admin/users/${person.id}`, { version: person.version, ...body });
      onSaved(saved, done(saved));
    } catch (err) {
      if (err instanceof ApiError) setProblems(err.fieldMessages());
      setError({ text: problemText(err), stale: err instanceof ApiError && err.code === 'changed_meanwhile' });
      setBusy(false);
      setConfirming(false);
    }
  }

  function saveDetails(e: FormEvent) {
    e.preventDefault();
    const changes: Record<string, unknown> = {};
    if (role !== person.role) changes.role = role;
    if (homeSiteId !== person.homeSiteId) changes.homeSiteId = homeSiteId;
    if (inspector !== person.qualifiedInspector) changes.qualifiedInspector = inspector;
    if (!Object.keys(changes).length) return onClose();
    void patch(changes, (p) => ({
      tone: 'good',
      text: changes.role ? `${p.name} is now ${ROLE_LABELS[p.role]}; they sign in again to continue.` : `Saved the changes to ${p.name}.`,
    }));
  }

  async function resend() {
    setBusy(true);
    setError(null);
    try {
      const res = await api.post<{ person: PersonRow; mail: MailOutcome }>(`/api/admin/users/${person.id}/invite`);
      onSaved(res.person, mailFlash(res.person, res.mail, 'A new invitation', timeZone));
    } catch (err) {
      setError({ text: problemText(err), stale: false });
      setBusy(false);
    }
  }

  async function endSessions() {
    setBusy(true);
    setError(null);
    try {
      await api.post(`/api/admin/users/${person.id}/sessions`);
      onSaved(person, { tone: 'good', text: `${person.name} is signed out on every device; they sign in again to continue.` });
    } catch (err) {
      setError({ text: problemText(err), stale: false });
      setBusy(false);
    }
  }

  return (
    <Dialog title={`Change ${person.name}`} labelId="edit-title" onClose={onClose}>
      <p className="-mt-1 text-sm text-ink-soft">
        {person.email} · {person.organisationName}
      </p>
      {error && (
        <div className="notice-fault mt-4" role="alert">
          {error.text}
          {error.stale && (
            <button type="button" className="ml-2 underline" onClick={() => void onReload().then(() => setError(null))}>
              Reload
            </button>
          )}
        </div>
      )}

      {person.active && (
        <form className="mt-4 space-y-4" onSubmit={saveDetails} noValidate id="edit-form">
          <div>
            <label className="label" htmlFor="edit-role">
              Role
            </label>
            <select id="edit-role" className="field" value={role} onChange={(e) => setRole(e.target.value as Role)} disabled={isSelf || !staff} aria-describedby="edit-role-hint">
              {(staff ? STAFF_ROLES : (['customer'] as Role[])).map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </select>
            <p id="edit-role-hint" className="mt-1 text-sm text-ink-soft">
              {isSelf
                ? 'You cannot change your own role; ask another administrator.'
                : staff
                  ? 'A new role takes effect at once: they are signed out and sign in again.'
                  : 'Customer accounts stay customer accounts. For staff access, invite a new account.'}
            </p>
          </div>
          <StaffFields
            role={role}
            homeSiteId={homeSiteId}
            setHomeSiteId={setHomeSiteId}
            inspector={inspector}
            setInspector={setInspector}
            choices={choices}
            problems={problems}
            idPrefix="edit"
          />
          <div className="flex justify-end">
            <button type="submit" className="btn-primary" disabled={busy} id="edit-save">
              Save changes
            </button>
          </div>
        </form>
      )}

      <section className="mt-6 border-t border-paper-line pt-4" aria-labelledby="access-title">
        <h3 id="access-title" className="font-semibold">
          Access
        </h3>
        {pendingInvite && (
          <div className="mt-2 flex flex-wrap items-center justify-between gap-3 text-sm">
            <span className="text-ink-soft">
              {person.inviteExpiresAt && new Date(person.inviteExpiresAt) > now ? 'Has not chosen a password yet.' : 'The invitation has expired without being used.'}
            </span>
            <button type="button" className="btn-quiet" onClick={() => void resend()} disabled={busy} id="resend-invite">
              Resend invitation
            </button>
          </div>
        )}
        {!person.active ? (
          <div className="mt-2 flex flex-wrap items-center justify-between gap-3 text-sm">
            <span className="text-ink-soft">Deactivated: cannot sign in. Their records stay.</span>
            <button
              type="button"
              className="btn-primary"
              disabled={busy}
              id="reactivate"
              onClick={() => void patch({ active: true }, (p) => ({ tone: 'good', text: `${p.name} is active again and can sign in.` }))}
            >
              Reactivate
            </button>
          </div>
        ) : isSelf ? (
          <p className="mt-2 text-sm text-ink-soft">You cannot deactivate your own account.</p>
        ) : confirming ? (
          <div className="notice-attention mt-2" role="alertdialog" aria-labelledby="deactivate-question">
            <p id="deactivate-question" className="font-medium">
              Deactivate {person.name}?
            </p>
            <p className="mt-1">They are signed out at once and cannot sign in until an administrator reactivates them. Their records and history stay.</p>
            <div className="mt-3 flex flex-wrap gap-3">
              <button type="button" className="btn-quiet" onClick={() => setConfirming(false)}>
                Keep active
              </button>
              <button
                type="button"
                className="btn-danger"
                disabled={busy}
                id="deactivate-confirm"
                onClick={() => void patch({ active: false }, (p) => ({ tone: 'good', text: `${p.name} is deactivated and signed out.` }))}
              >
                Deactivate
              </button>
            </div>
          </div>
        ) : (
          <div className="mt-2 flex flex-wrap items-center justify-between gap-3 text-sm">
            <span className="text-ink-soft">Deactivating signs them out everywhere at once.</span>
            <button type="button" className="btn-quiet text-brick" onClick={() => setConfirming(true)} id="deactivate">
              Deactivate…
            </button>
          </div>
        )}
        {person.active && person.hasPassword && (
          <div className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm">
            <span className="text-ink-soft">A lost phone or a shared computer left signed in: end every session they have.</span>
            <button type="button" className="btn-quiet" disabled={busy} id="end-sessions" onClick={() => void endSessions()}>
              Sign out everywhere
            </button>
          </div>
        )}
      </section>
    </Dialog>
  );
}
