import { useMemo, useState } from 'react';
import { DG_NOT_CHECKED, FILL_CAUTIONS, PACKING_GROUP_NAMES, planFill, type FillLimitBasis, type PackingGroup } from '@/lib/planning/filling';
import type { FillPlannerData } from '@/lib/planning/orders.server';
import { Icon } from '@/components/ui/Icon';

const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));
const fmt = (n: number, digits = 1) => n.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });

/**
 * How full the order's bins may be filled and whether the planned fill fits, worked in the browser with the
 * same pure module the tests check (ADR 4.1.1.4). Nothing is saved.
 */
export function FillPlanner({ data }: { data: FillPlannerData }) {
  const [method, setMethod] = useState<'formula' | 'boiling-point'>('formula');
  const [d15, setD15] = useState('');
  const [d50, setD50] = useState('');
  const [ibp, setIbp] = useState('');
  const [fillTemp, setFillTemp] = useState('15');
  const [density, setDensity] = useState('');
  const [targetKind, setTargetKind] = useState<'volumeL' | 'massKg'>('volumeL');
  const [target, setTarget] = useState('');
  const [dangerous, setDangerous] = useState(false);
  const [pg, setPg] = useState<PackingGroup>(3);
  const [mark, setMark] = useState(data.usualMark ?? '');

  const result = useMemo(() => {
    const missing: string[] = [];
    if (method === 'formula' && (Number.isNaN(num(d15)) || Number.isNaN(num(d50)))) missing.push('the densities at 15 °C and 50 °C');
    if (method === 'boiling-point' && Number.isNaN(num(ibp))) missing.push('the initial boiling point');
    if (Number.isNaN(num(fillTemp))) missing.push('the filling temperature');
    if (Number.isNaN(num(density))) missing.push('the density at the filling temperature');
    if (Number.isNaN(num(target))) missing.push('the target');
    if (missing.length) return { ok: false as const, message: `Enter ${missing.join(', ')}.`, incomplete: true };
    const limit: FillLimitBasis = method === 'formula' ? { method, d15: num(d15), d50: num(d50) } : { method, initialBoilingPointC: num(ibp) };
    const r = planFill({
      capacityL: data.binType.capacityL,
      tareKg: data.binType.tareKg,
      maxGrossKg: data.binType.maxGrossKg,
      unMarking: mark || null,
      fillTempC: num(fillTemp),
      densityKgPerL: num(density),
      limit,
      target: targetKind === 'volumeL' ? { volumeL: num(target) } : { massKg: num(target) },
      linerMaxFillTempC: data.linerMaxFillTempC,
      packingGroup: dangerous ? pg : null,
    });
    return r.ok ? { ok: true as const, plan: r.plan } : { ok: false as const, message: r.message, incomplete: false };
  }, [method, d15, d50, ibp, fillTemp, density, targetKind, target, dangerous, pg, mark, data]);

  const input = (id: string, label: string, value: string, set: (v: string) => void, hint?: string) => (
    <div>
      <label className="label" htmlFor={id}>
        {label}
      </label>
      <input id={id} className="field num" inputMode="decimal" value={value} onChange={(e) => set(e.target.value)} aria-describedby={hint ? `${id}-hint` : undefined} />
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-ink-soft">
          {hint}
        </p>
      )}
    </div>
  );

  return (
    <div className="mt-4 grid gap-4 lg:grid-cols-2" data-testid="fill-planner">
      <form className="card p-4 space-y-4" onSubmit={(e) => e.preventDefault()}>
        <fieldset className="space-y-2">
          <legend className="font-medium">Fill limit by</legend>
          <label className="flex items-center gap-2 min-h-touch">
            <input type="radio" name="method" className="h-5 w-5 accent-kelp" checked={method === 'formula'} onChange={() => setMethod('formula')} /> Densities at 15 °C and 50 °C
            (ADR 4.1.1.4 (b), any filling temperature)
          </label>
          <label className="flex items-center gap-2 min-h-touch">
            <input
              type="radio"
              name="method"
              className="h-5 w-5 accent-kelp"
              checked={method === 'boiling-point'}
              onChange={() => setMethod('boiling-point')}
              data-testid="method-ibp"
            />{' '}
            Initial boiling point (ADR 4.1.1.4 (a), filling at 15 °C only)
          </label>
        </fieldset>
        {method === 'formula' ? (
          <div className="grid gap-3 sm:grid-cols-2">
            {input('f-d15', 'Density at 15 °C (g/mL)', d15, setD15)}
            {input('f-d50', 'Density at 50 °C (g/mL)', d50, setD50)}
          </div>
        ) : (
          input('f-ibp', 'Initial boiling point (°C)', ibp, setIbp)
        )}
        <div className="grid gap-3 sm:grid-cols-2">
          {input(
            'f-temp',
            'Mean liquid temperature at filling (°C)',
            fillTemp,
            setFillTemp,
            data.linerMaxFillTempC !== null ? `The order's liner takes at most ${data.linerMaxFillTempC} °C.` : undefined,
          )}
          {input('f-density', 'Density at the filling temperature (kg/L)', density, setDensity)}
        </div>
        <div className="grid gap-3 sm:grid-cols-2 items-end">
          <div>
            <label className="label" htmlFor="f-target-kind">
              Target per bin as
            </label>
            <select id="f-target-kind" className="field" value={targetKind} onChange={(e) => setTargetKind(e.target.value as 'volumeL' | 'massKg')}>
              <option value="volumeL">volume (L)</option>
              <option value="massKg">mass of product (kg)</option>
            </select>
          </div>
          {input('f-target', targetKind === 'volumeL' ? 'Target volume (L)' : 'Target mass (kg)', target, setTarget)}
        </div>
        <fieldset className="space-y-2 border-t border-paper-line pt-3">
          <label className="flex items-center gap-2 min-h-touch">
            <input type="checkbox" className="h-5 w-5 accent-kelp" checked={dangerous} onChange={(e) => setDangerous(e.target.checked)} data-testid="f-dg" /> Dangerous goods
          </label>
          {dangerous && (
            <div className="grid gap-3 sm:grid-cols-2">
              <div>
                <label className="label" htmlFor="f-pg">
                  Packing group of the product
                </label>
                <select id="f-pg" className="field" value={pg} onChange={(e) => setPg(Number(e.target.value) as PackingGroup)}>
                  {([1, 2, 3] as const).map((g) => (
                    <option key={g} value={g}>
                      {PACKING_GROUP_NAMES[g]}
                    </option>
                  ))}
                </select>
              </div>
              <div>
                <label className="label" htmlFor="f-mark">
                  UN mark of the bins
                </label>
                <input id="f-mark" className="field ident" value={mark} onChange={(e) => setMark(e.target.value)} spellCheck={false} aria-describedby="f-mark-hint" />
                <p id="f-mark-hint" className="mt-1 text-sm text-ink-soft">
                  {data.usualMark
                    ? `${data.binsWithUsualMark} of ${data.binsOfType} bins of this type carry this mark; check the bins you load.`
                    : 'No bin of this type has a UN mark on record.'}
                </p>
              </div>
            </div>
          )}
        </fieldset>
      </form>

      <section className="card p-4 space-y-3" aria-live="polite" data-testid="fill-result">
        <h2>
          Result for one {data.binType.name} ({data.binType.capacityL} L)
        </h2>
        {!result.ok ? (
          <p className={result.incomplete ? 'text-ink-soft' : 'notice-fault'} role={result.incomplete ? undefined : 'alert'}>
            {result.message}
          </p>
        ) : (
          <>
            <p data-testid="fill-max" data-percent={result.plan.maxFillPercent.toFixed(2)} data-litres={result.plan.maxFillL.toFixed(1)}>
              Maximum fill <strong className="num">{fmt(result.plan.maxFillPercent, 2)} %</strong> = <strong className="num">{fmt(result.plan.maxFillL)} L</strong> (
              {fmt(result.plan.maxFillKg)} kg).
              <span className="block text-sm text-ink-soft">{result.plan.limitBasis}</span>
            </p>
            <p className="text-sm">
              Most product the bin takes under both the fill limit and the gross mass: <span className="num">{fmt(result.plan.maxProductKg)} kg</span>.
            </p>
            <p className="text-sm">
              Target:{' '}
              <span className="num">
                {fmt(result.plan.targetL)} L · {fmt(result.plan.targetKg)} kg · {fmt(result.plan.targetPercent, 2)} %
              </span>
              . {result.plan.gross.message}.
            </p>
            {result.plan.fits ? (
              <p className="notice-good flex items-start gap-2" data-testid="fill-verdict" data-fits="true">
                <Icon name="check" size={18} className="mt-0.5 shrink-0" /> The target fits.
              </p>
            ) : (
              <div className="notice-fault" data-testid="fill-verdict" data-fits="false" role="alert">
                <p className="flex items-start gap-2 font-medium">
                  <Icon name="alert" size={18} className="mt-0.5 shrink-0" /> The target does not fit:
                </p>
                <ul className="list-disc ml-6 mt-1">
                  {result.plan.problems.map((p) => (
                    <li key={p}>{p}</li>
                  ))}
                </ul>
              </div>
            )}
            {result.plan.dangerousGoods && (
              <p className="text-sm text-ink-soft" data-testid="dg-not-checked">
                {result.plan.dangerousGoods.notChecked}
              </p>
            )}
          </>
        )}
        {dangerous && !result.ok && <p className="text-sm text-ink-soft">{DG_NOT_CHECKED}</p>}
        <div className="border-t border-paper-line pt-3">
          <h3 className="font-medium">Before filling</h3>
          <ul className="list-disc ml-5 mt-1 text-sm space-y-1">
            {FILL_CAUTIONS.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </div>
      </section>
    </div>
  );
}
