/** The element table of the orbit-solution form: each element's value and, where it has one, its 1σ. */
import type { UncertainTerm } from '../../../descriptors/covariance.ts';
import { elementRows, type ElementsKind, type SolutionDraft } from './solution-input.ts';

export interface DraftProps {
  draft: SolutionDraft;
  set: (patch: Partial<SolutionDraft>) => void;
  /** Messages by form field: request paths without `orbit.`, `sigma-…`, `rho-…`. */
  msgs: Record<string, string>;
}

const msgOf = (msgs: Record<string, string>, k: string) =>
  msgs[k] && <span class="field-msg">{msgs[k]}</span>;

const KINDS: [ElementsKind, string][] = [
  ['campbell', 'Campbell elements'],
  ['thiele-innes', 'Thiele–Innes constants'],
];

/** Which form the elements take: Campbell elements or Thiele–Innes constants. */
export function ElementKindChoice({ draft, set }: DraftProps) {
  return (
    <div class="toolbar">
      {KINDS.map(([kind, label]) => (
        <label class="inline" key={kind}>
          <input
            type="radio"
            name="elements-kind"
            checked={draft.kind === kind}
            onChange={() => set({ kind })}
          />{' '}
          {label}
        </label>
      ))}
    </div>
  );
}

export function ElementTable({ draft, set, msgs }: DraftProps) {
  const sigmaOf = (p: UncertainTerm, text: string) =>
    set({ sigmas: { ...draft.sigmas, [p]: text } });
  return (
    <table class="data element-table">
      <thead>
        <tr>
          <th>element</th>
          <th>value</th>
          <th>1σ (optional)</th>
        </tr>
      </thead>
      <tbody>
        {elementRows(draft.kind).map((el) => (
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
                value={draft.values[el.key] ?? ''}
                onInput={(e) =>
                  set({ values: { ...draft.values, [el.key]: e.currentTarget.value } })
                }
              />
              {msgOf(msgs, el.key)}
            </td>
            <td>
              {el.sigma ? (
                <>
                  <input
                    name={`sigma-${el.sigma}`}
                    aria-label={`1σ of ${el.label}`}
                    aria-invalid={!!msgs[`sigma-${el.sigma}`]}
                    disabled={draft.mode !== 'sigmas'}
                    value={draft.sigmas[el.sigma] ?? ''}
                    onInput={(e) => sigmaOf(el.sigma!, e.currentTarget.value)}
                  />
                  {msgOf(msgs, `sigma-${el.sigma}`)}
                </>
              ) : (
                <span class="muted">see below</span>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
