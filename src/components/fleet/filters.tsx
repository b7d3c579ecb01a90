// Column filters AG Grid's community edition does not have: a set filter (pick
// statuses, sites, customers, types) and a yes/no filter for flags. Their models
// are the shapes src/lib/fleet/grid-query.ts accepts; the server does the filtering.
import { useMemo, useState } from 'react';
import { useGridFilter, type CustomFilterProps } from 'ag-grid-react';

export interface SetOption {
  value: string | number | null;
  label: string;
}
interface SetModel {
  filterType: 'set';
  values: Array<string | number | null>;
}

const passAll = () => true; // rows are filtered on the server; the grid never filters locally

export function SetFilter(props: CustomFilterProps<unknown, unknown, SetModel> & { options: SetOption[] }) {
  const { model, onModelChange, options, colDef } = props;
  useGridFilter({ doesFilterPass: passAll });
  const [search, setSearch] = useState('');
  const selected = useMemo(() => new Set(model ? model.values : options.map((o) => o.value)), [model, options]);
  const shown = search ? options.filter((o) => o.label.toLowerCase().includes(search.toLowerCase())) : options;

  function update(next: Set<SetOption['value']>) {
    if (next.size === options.length)
      onModelChange(null); // everything ticked = no filter
    else onModelChange({ filterType: 'set', values: options.map((o) => o.value).filter((v) => next.has(v)) });
  }
  function toggle(value: SetOption['value']) {
    const next = new Set(selected);
    if (next.has(value)) next.delete(value);
    else next.add(value);
    update(next);
  }
  const name = colDef.headerName ?? 'values';
  return (
    <div className="w-72 p-3 text-sm" role="group" aria-label={`Filter by ${name}`}>
      {options.length > 8 && (
        <input
          type="search"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          placeholder={`Search ${name.toLowerCase()}…`}
          className="mb-2 block w-full rounded border border-ink-faint px-2 py-1.5"
          aria-label={`Search ${name.toLowerCase()}`}
        />
      )}
      <div className="mb-2 flex gap-3">
        <button type="button" className="text-kelp underline" onClick={() => update(new Set(options.map((o) => o.value)))}>
          All
        </button>
        <button type="button" className="text-kelp underline" onClick={() => update(new Set())}>
          None
        </button>
      </div>
      <ul className="max-h-64 overflow-y-auto">
        {shown.map((o) => (
          <li key={String(o.value)}>
            <label className="flex min-h-[32px] cursor-pointer items-center gap-2">
              <input type="checkbox" checked={selected.has(o.value)} onChange={() => toggle(o.value)} />
              <span>{o.label}</span>
            </label>
          </li>
        ))}
        {shown.length === 0 && <li className="text-ink-faint">Nothing matches “{search}”.</li>}
      </ul>
    </div>
  );
}

interface BooleanModel {
  filterType: 'boolean';
  value: boolean;
}

export function BooleanFilter(props: CustomFilterProps<unknown, unknown, BooleanModel>) {
  const { model, onModelChange, colDef } = props;
  useGridFilter({ doesFilterPass: passAll });
  const current = model ? (model.value ? 'yes' : 'no') : 'any';
  const name = colDef.headerName ?? 'flag';
  const choose = (v: string) => onModelChange(v === 'any' ? null : { filterType: 'boolean', value: v === 'yes' });
  return (
    <fieldset className="w-56 p-3 text-sm">
      <legend className="mb-1 font-medium">{name}</legend>
      {(['any', 'yes', 'no'] as const).map((v) => (
        <label key={v} className="flex min-h-[32px] cursor-pointer items-center gap-2">
          <input type="radio" name={`flag-${colDef.colId ?? colDef.field}`} checked={current === v} onChange={() => choose(v)} />
          {v === 'any' ? 'Any' : v === 'yes' ? 'Yes' : 'No'}
        </label>
      ))}
    </fieldset>
  );
}
