// Choosing, saving, sharing, renaming and deleting saved views of the fleet grid.
// The list comes through SWR (first value from the server render); changes go
// through the typed API client and then refresh the list.
import { useState } from 'react';
import useSWR from 'swr';
import { api, fetcher, ApiError } from '@/lib/api.client';
import { Icon } from '@/components/ui/Icon';
import type { ViewState } from '@/lib/fleet/grid-views';
import type { ViewSummary } from './types';

const VIEWS_KEY = '/api/fleet/views';

interface Props {
  initialViews: ViewSummary[];
  selectedId: string | null;
  modified: boolean;
  onSelect: (view: ViewSummary | null) => void;
  currentState: () => ViewState;
  /** More controls for the same row (the grid's quick filter, columns, export). */
  children?: React.ReactNode;
}

type Mode = { kind: 'idle' } | { kind: 'save' } | { kind: 'rename' } | { kind: 'confirmDelete' };

export function ViewBar({ initialViews, selectedId, modified, onSelect, currentState, children }: Props) {
  const { data: views = initialViews, mutate } = useSWR<ViewSummary[]>(VIEWS_KEY, fetcher, { fallbackData: initialViews, revalidateOnFocus: false });
  const [mode, setMode] = useState<Mode>({ kind: 'idle' });
  const [name, setName] = useState('');
  const [shared, setShared] = useState(false);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: 'fault' | 'good'; text: string } | null>(null);
  const selected = views.find((v) => v.id === selectedId) ?? null;
  const own = selected?.kind === 'own';

  async function act(fn: () => Promise<ViewSummary | null>, done: string) {
    setBusy(true);
    setMessage(null);
    try {
      const result = await fn();
      await mutate();
      setMode({ kind: 'idle' });
      setMessage({ tone: 'good', text: done });
      if (result) onSelect(result);
    } catch (err) {
      setMessage({ tone: 'fault', text: err instanceof ApiError ? err.message : 'Something went wrong. Try again.' });
    } finally {
      setBusy(false);
    }
  }

  const saveNew = () => act(() => api<ViewSummary>(VIEWS_KEY, { method: 'POST', body: { name, shared, state: currentState() } }), `Saved “${name.trim()}”.`);
  const saveChanges = () =>
    act(
      () => api<ViewSummary>(`${VIEWS_KEY}/${selected!.id}`, { method: 'PATCH', body: { state: currentState(), version: selected!.version } }),
      `Saved the changes to “${selected!.name}”.`,
    );
  const rename = () =>
    act(() => api<ViewSummary>(`${VIEWS_KEY}/${selected!.id}`, { method: 'PATCH', body: { name, shared, version: selected!.version } }), `Updated “${name.trim()}”.`);
  const remove = () =>
    act(async () => {
      await api(`${VIEWS_KEY}/${selected!.id}`, { method: 'DELETE' });
      onSelect(null);
      return null;
    }, `Deleted “${selected!.name}”.`);

  const groups: Array<[string, ViewSummary[]]> = [
    ['Built in', views.filter((v) => v.kind === 'builtin')],
    ['My views', views.filter((v) => v.kind === 'own')],
    ['Shared by others', views.filter((v) => v.kind === 'shared')],
  ];

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-end gap-2">
        <div>
          <label className="label" htmlFor="view-select">
            View
          </label>
          <select id="view-select" className="field min-w-[16rem]" value={selectedId ?? ''} onChange={(e) => onSelect(views.find((v) => v.id === e.target.value) ?? null)}>
            <option value="">All bins (default)</option>
            {groups
              .filter(([, list]) => list.length)
              .map(([label, list]) => (
                <optgroup key={label} label={label}>
                  {list.map((v) => (
                    <option key={v.id} value={v.id}>
                      {v.name}
                      {v.kind === 'shared' && v.ownerName ? ` — ${v.ownerName}` : ''}
                      {v.kind === 'own' && v.shared ? ' (shared)' : ''}
                    </option>
                  ))}
                </optgroup>
              ))}
          </select>
        </div>
        {own && modified && (
          <button type="button" className="btn-primary" disabled={busy} onClick={saveChanges}>
            Save changes
          </button>
        )}
        <button
          type="button"
          className="btn-quiet"
          disabled={busy}
          onClick={() => {
            setName('');
            setShared(false);
            setMode({ kind: 'save' });
          }}
        >
          Save as new view
        </button>
        {own && (
          <>
            <button
              type="button"
              className="btn-quiet"
              disabled={busy}
              onClick={() => {
                setName(selected!.name);
                setShared(selected!.shared);
                setMode({ kind: 'rename' });
              }}
            >
              Rename or share
            </button>
            <button type="button" className="btn-quiet text-brick" disabled={busy} onClick={() => setMode({ kind: 'confirmDelete' })}>
              Delete
            </button>
          </>
        )}
        {children}
      </div>
      {selected?.description && <p className="text-sm text-ink-soft">{selected.description}</p>}
      {selected?.kind === 'shared' && <p className="text-sm text-ink-soft">Shared by {selected.ownerName}. To keep changes, save them as a view of your own.</p>}

      {(mode.kind === 'save' || mode.kind === 'rename') && (
        <form
          className="card flex flex-wrap items-end gap-3 p-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (mode.kind === 'save') saveNew();
            else rename();
          }}
        >
          <div>
            <label className="label" htmlFor="view-name">
              View name
            </label>
            <input id="view-name" className="field w-72" maxLength={80} required value={name} onChange={(e) => setName(e.target.value)} autoFocus />
          </div>
          <label className="flex min-h-touch items-center gap-2">
            <input type="checkbox" checked={shared} onChange={(e) => setShared(e.target.checked)} />
            Share with all planners and admins
          </label>
          <button type="submit" className="btn-primary" disabled={busy || !name.trim()}>
            {mode.kind === 'save' ? 'Save view' : 'Update view'}
          </button>
          <button type="button" className="btn-quiet" onClick={() => setMode({ kind: 'idle' })}>
            Cancel
          </button>
          {mode.kind === 'save' && <p className="w-full text-sm text-ink-soft">Saves the current filters, sort order and columns.</p>}
        </form>
      )}

      {mode.kind === 'confirmDelete' && selected && (
        <div className="notice-attention flex flex-wrap items-center gap-3" role="alertdialog" aria-label="Confirm deleting the view">
          <Icon name="alert" />
          <span>
            Delete the view “{selected.name}”{selected.shared ? ', which other planners use too' : ''}? This cannot be undone.
          </span>
          <button type="button" className="btn-danger" disabled={busy} onClick={remove}>
            Delete view
          </button>
          <button type="button" className="btn-quiet" onClick={() => setMode({ kind: 'idle' })}>
            Keep it
          </button>
        </div>
      )}

      {message && (
        <p className={message.tone === 'fault' ? 'notice-fault' : 'notice-good'} role={message.tone === 'fault' ? 'alert' : 'status'}>
          {message.text}
        </p>
      )}
    </div>
  );
}
