/**
 * How the orbit-solution form takes the uncertainty: the σ of the element table with a
 * correlation per pair, or a covariance pasted as a matrix over named Campbell parameters.
 */
import {
  COVARIANCE_TERMS,
  THIELE_INNES_TERMS,
  type UncertainTerm,
} from '../../../descriptors/covariance.ts';
import type { DraftProps } from './solution-elements.tsx';
import { correlationPairs, type UncertaintyMode } from './solution-input.ts';

const symbol = (p: UncertainTerm) =>
  [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS].find((t) => t.parameter === p)!.symbol;
const MODES: [UncertaintyMode, string][] = [
  ['sigmas', 'uncertainty from the σ above and these correlations'],
  ['matrix', 'a covariance matrix pasted below'],
];

export function UncertaintyInput({ draft, set, msgs }: DraftProps) {
  const pairs = correlationPairs(draft);
  const covMsg = Object.entries(msgs).find(([k]) => k.startsWith('covariance'))?.[1];
  return (
    <>
      <div class="toolbar">
        {MODES.map(([mode, label]) => (
          <label class="inline" key={mode}>
            <input
              type="radio"
              name="uncertainty"
              checked={draft.mode === mode}
              onChange={() => set({ mode })}
            />{' '}
            {label}
          </label>
        ))}
      </div>
      {draft.kind === 'thiele-innes' && (
        <p class="muted thiele-innes-note">
          The σ and correlations of A, B, F, G are carried to a, i, Ω, ω at these constants by
          first-order propagation (the Jacobian of the conversion), the form in which every solution
          keeps its covariance: the stored solution lists σ for a, i, Ω, ω, and its predictions
          carry the same uncertainty. A pasted matrix may name A, B, F, G in place of those four.
        </p>
      )}
      {draft.mode === 'sigmas' &&
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
                  aria-invalid={!!msgs[`rho-${a}-${b}`]}
                  value={draft.rho[`${a}/${b}`] ?? ''}
                  onInput={(e) =>
                    set({ rho: { ...draft.rho, [`${a}/${b}`]: e.currentTarget.value } })
                  }
                />
                {msgs[`rho-${a}-${b}`] && <span class="field-msg">{msgs[`rho-${a}-${b}`]}</span>}
              </label>
            ))}
          </div>
        ))}
      {covMsg && (
        <p class="field-msg" role="alert">
          covariance: {covMsg}
        </p>
      )}
      {draft.mode === 'matrix' && (
        <label class="field wide">
          <span>
            covariance: a row of element symbols (P T e a i Ω ω d γ q β, or A B F G), then the
            matrix in their units (T in days)
          </span>
          <textarea
            name="covariance"
            rows={5}
            placeholder={'P T e\n0.0004 0 0\n0 9 0.006\n0 0.006 0.000016'}
            value={draft.matrixText}
            onInput={(e) => set({ matrixText: e.currentTarget.value })}
          />
        </label>
      )}
    </>
  );
}
