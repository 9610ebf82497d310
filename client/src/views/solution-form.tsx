/**
 * A new orbit solution typed in: Campbell elements, each with its 1σ, the correlations of the
 * pairs that have one, or a covariance pasted as a matrix. The server checks it with the same
 * rules as every other path (the orbit engine's validation: 422 naming the element), and the
 * message lands beside the field it names.
 */
import { useState } from 'preact/hooks';
import {
  COVARIANCE_TERMS,
  covarianceOf,
  type Correlation,
  type CovarianceTerm,
} from '../../../descriptors/covariance.ts';
import { fieldMessages, sendRecord } from '../api/client.ts';
import { invalidateCatalogue, type Catalogue } from '../api/catalogue.ts';
import { ErrorLine } from '../lib/ui.tsx';

/** The elements and orbit quantities the form asks for: request path, label, and its σ's parameter. */
const ELEMENTS: { key: string; label: string; sigma: CovarianceTerm | null; hint?: string }[] = [
  { key: 'elements.periodYears', label: 'P, period (yr)', sigma: 'periodYears' },
  {
    key: 'elements.periapsis',
    label: 'T, periapsis epoch',
    sigma: 'periapsisDays',
    hint: 'ISO 8601 with zone, JD, MJD, or a decimal year; its σ in days',
  },
  { key: 'elements.eccentricity', label: 'e, eccentricity', sigma: 'eccentricity' },
  {
    key: 'elements.semiMajorAxisArcsec',
    label: 'a, semi-major axis (″)',
    sigma: 'semiMajorAxisArcsec',
  },
  { key: 'elements.inclinationDeg', label: 'i, inclination (°)', sigma: 'inclinationDeg' },
  { key: 'elements.ascendingNodeDeg', label: 'Ω, ascending node (°)', sigma: 'ascendingNodeDeg' },
  {
    key: 'elements.argPeriapsisDeg',
    label: 'ω, argument of periapsis (°)',
    sigma: 'argPeriapsisDeg',
  },
  { key: 'distancePc', label: 'distance (pc, optional)', sigma: 'distancePc' },
  {
    key: 'systemicVelocityKmS',
    label: 'γ, systemic velocity (km/s, optional)',
    sigma: 'systemicVelocityKmS',
  },
  {
    key: 'massRatio',
    label: 'q = M₂/M₁, mass ratio (optional)',
    sigma: 'massRatio',
    hint: 'a binary of comparable masses: gives each body’s velocity',
  },
  {
    key: 'lightFraction',
    label: 'β = L₂/(L₁+L₂), light fraction (optional)',
    sigma: 'lightFraction',
    hint: 'the secondary’s share of the light: with q, the photocentre',
  },
];
const OPTIONAL = new Set(['distancePc', 'systemicVelocityKmS', 'massRatio', 'lightFraction']);
const symbol = (p: CovarianceTerm) => COVARIANCE_TERMS.find((t) => t.parameter === p)!.symbol;

/** A pasted covariance: a first row of parameter names, then one row of numbers per parameter. */
export function parseCovarianceText(
  text: string,
): { parameters: string[]; matrix: number[][] } | { rule: string } {
  const rows = text
    .trim()
    .split(/\n+/)
    .map((l) =>
      l
        .trim()
        .split(/[\s,;]+/)
        .filter(Boolean),
    );
  const [names, ...body] = rows;
  if (!names?.length) return { rule: 'is empty: give a row of parameter names, then the matrix' };
  const known = new Set<string>(COVARIANCE_TERMS.map((t) => t.parameter));
  const unknown = names.filter((n) => !known.has(n));
  if (unknown.length)
    return {
      rule: `names ${unknown.join(', ')}: the first row must name parameters among ${[...known].join(', ')}`,
    };
  if (body.length !== names.length || body.some((r) => r.length !== names.length))
    return { rule: `must have ${names.length} rows of ${names.length} numbers under the names` };
  const matrix = body.map((r) => r.map(Number));
  if (matrix.flat().some((x) => !Number.isFinite(x)))
    return { rule: 'holds a cell that is not a number (use a decimal point)' };
  return { parameters: names, matrix };
}

export function SolutionForm({ cat, onCreated }: { cat: Catalogue; onCreated: () => void }) {
  const [targetId, setTargetId] = useState(String(cat.targets[0]?.id ?? ''));
  const [v, setV] = useState<Record<string, string>>({});
  const [rho, setRho] = useState<Record<string, string>>({});
  const [mode, setMode] = useState<'sigmas' | 'matrix'>('sigmas');
  const [matrixText, setMatrixText] = useState('');
  const [reference, setReference] = useState('');
  const [makeCurrent, setMakeCurrent] = useState(true);
  const [error, setError] = useState<unknown>(null);
  const [local, setLocal] = useState<{ field: string; rule: string } | null>(null);
  const [created, setCreated] = useState('');
  const server = fieldMessages(error);
  const msgs: Record<string, string> = {
    ...Object.fromEntries(Object.entries(server).map(([k, m]) => [k.replace(/^orbit\./, ''), m])),
    ...(local ? { [local.field]: local.rule } : {}),
  };
  const withSigma = ELEMENTS.filter((e) => e.sigma && (v[`σ ${e.key}`] ?? '').trim() !== '');
  const pairs: [CovarianceTerm, CovarianceTerm][] = [];
  for (let i = 0; i < withSigma.length; i++)
    for (let j = i + 1; j < withSigma.length; j++)
      pairs.push([withSigma[i]!.sigma!, withSigma[j]!.sigma!]);
  const num = (s: string) => (s.trim() === '' ? undefined : Number(s));
  const submit = async (e: Event) => {
    e.preventDefault();
    setError(null);
    setLocal(null);
    setCreated('');
    const orbit: Record<string, unknown> = { elements: {} as Record<string, unknown> };
    for (const el of ELEMENTS) {
      const text = (v[el.key] ?? '').trim();
      if (text === '' && OPTIONAL.has(el.key)) continue;
      const [head, tail] = el.key.split('.') as [string, string | undefined];
      const value = el.key === 'elements.periapsis' ? text : text === '' ? NaN : Number(text);
      if (typeof value === 'number' && !Number.isFinite(value))
        return setLocal({
          field: el.key,
          rule: `${JSON.stringify(text)} must be a number (use a decimal point)`,
        });
      if (tail) (orbit.elements as Record<string, unknown>)[tail] = value;
      else orbit[head] = value;
    }
    if (mode === 'matrix' && matrixText.trim()) {
      const m = parseCovarianceText(matrixText);
      if ('rule' in m) return setLocal({ field: 'covariance', rule: m.rule });
      orbit.covariance = m;
    } else if (mode === 'sigmas') {
      const sigmas: Partial<Record<CovarianceTerm, number>> = {};
      for (const el of withSigma) sigmas[el.sigma!] = num(v[`σ ${el.key}`] ?? '') ?? NaN;
      const correlations: Correlation[] = pairs.flatMap(([a, b]) => {
        const r = num(rho[`${a}/${b}`] ?? '');
        return r === undefined ? [] : [{ a, b, rho: r }];
      });
      const cov = covarianceOf(sigmas, correlations);
      if (cov && 'rule' in cov)
        return setLocal({ field: 'covariance', rule: `${cov.field}: ${cov.rule}` });
      if (cov) orbit.covariance = cov;
    }
    try {
      const row = await sendRecord('POST', '/orbit-solutions', {
        targetId: Number(targetId),
        orbit,
        reference,
        makeCurrent,
      });
      setCreated(`Stored as solution #${row.id}${makeCurrent ? ', now current' : ''}.`);
      invalidateCatalogue();
      onCreated();
    } catch (err) {
      setError(err);
    }
  };
  const msgOf = (k: string) => msgs[k] && <span class="field-msg">{msgs[k]}</span>;
  const covMsg = Object.entries(msgs).find(([k]) => k.startsWith('covariance'))?.[1];
  return (
    <form
      class="create-form solution-form"
      aria-label="New orbit solution"
      onSubmit={submit}
      noValidate
    >
      <fieldset>
        <legend>New orbit solution</legend>
        <div class="field-grid">
          <label class="field">
            <span>target</span>
            <select
              name="targetId"
              value={targetId}
              onChange={(e) => setTargetId(e.currentTarget.value)}
            >
              {cat.targets.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </label>
          <label class="field">
            <span>reference (optional)</span>
            <input
              name="reference"
              value={reference}
              onInput={(e) => setReference(e.currentTarget.value)}
            />
          </label>
          <label class="field">
            <span>make it the target’s current solution</span>
            <input
              type="checkbox"
              name="makeCurrent"
              checked={makeCurrent}
              onChange={(e) => setMakeCurrent(e.currentTarget.checked)}
            />
          </label>
        </div>
        <table class="data element-table">
          <thead>
            <tr>
              <th>element</th>
              <th>value</th>
              <th>1σ (optional)</th>
            </tr>
          </thead>
          <tbody>
            {ELEMENTS.map((el) => (
              <tr key={el.key} class={msgs[el.key] ? 'invalid' : ''}>
                <th scope="row">
                  {el.label}
                  {el.hint && <span class="muted hint"> · {el.hint}</span>}
                </th>
                <td>
                  <input
                    name={el.key}
                    aria-label={el.label}
                    aria-invalid={!!msgs[el.key]}
                    value={v[el.key] ?? ''}
                    onInput={(e) => setV({ ...v, [el.key]: e.currentTarget.value })}
                  />
                  {msgOf(el.key)}
                </td>
                <td>
                  <input
                    name={`sigma-${el.sigma}`}
                    aria-label={`1σ of ${el.label}`}
                    disabled={mode !== 'sigmas'}
                    value={v[`σ ${el.key}`] ?? ''}
                    onInput={(e) => setV({ ...v, [`σ ${el.key}`]: e.currentTarget.value })}
                  />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <div class="toolbar">
          <label class="inline">
            <input
              type="radio"
              name="uncertainty"
              checked={mode === 'sigmas'}
              onChange={() => setMode('sigmas')}
            />{' '}
            uncertainty from the σ above and these correlations
          </label>
          <label class="inline">
            <input
              type="radio"
              name="uncertainty"
              checked={mode === 'matrix'}
              onChange={() => setMode('matrix')}
            />{' '}
            a covariance matrix pasted below
          </label>
        </div>
        {mode === 'sigmas' &&
          (pairs.length === 0 ? (
            <p class="muted">Give a σ for two or more elements to enter their correlations.</p>
          ) : (
            <div class="field-grid correlations">
              {pairs.map(([a, b]) => (
                <label class="field" key={`${a}/${b}`}>
                  <span>
                    ρ({symbol(a)}, {symbol(b)})
                  </span>
                  <input
                    name={`rho-${a}-${b}`}
                    placeholder="0"
                    value={rho[`${a}/${b}`] ?? ''}
                    onInput={(e) => setRho({ ...rho, [`${a}/${b}`]: e.currentTarget.value })}
                  />
                </label>
              ))}
            </div>
          ))}
        {mode === 'matrix' && (
          <label class="field wide">
            <span>
              covariance: a row of parameter names, then the matrix in their units (T in days)
            </span>
            <textarea
              name="covariance"
              rows={5}
              placeholder={
                'periodYears periapsisDays eccentricity\n0.0004 0 0\n0 9 0.006\n0 0.006 0.000016'
              }
              value={matrixText}
              onInput={(e) => setMatrixText(e.currentTarget.value)}
            />
          </label>
        )}
        {covMsg && (
          <p class="field-msg" role="alert">
            covariance: {covMsg}
          </p>
        )}
        <div class="toolbar">
          <button type="submit" class="primary">
            Store solution
          </button>
          {created && (
            <span class="created" role="status">
              {created}
            </span>
          )}
        </div>
        {error !== null && !Object.keys(server).length ? <ErrorLine error={error} /> : null}
        {(error !== null || local) && (
          <p class="muted">Nothing was stored; correct the marked field and store again.</p>
        )}
      </fieldset>
    </form>
  );
}
