/**
 * The relativistic terms of an orbit solution: which are on (all off by default, the usual case
 * for binaries) and the factors that scale them (1 is general relativity, 0 Newtonian).
 */
import { RELATIVITY_WORDS } from '../lib/numbers.ts';
import type { DraftProps } from './solution-elements.tsx';
import { FACTORS, RELATIVITY_SWITCHES } from './solution-input.ts';

export function RelativityInput({ draft, set, msgs }: DraftProps) {
  const fieldMsg = Object.entries(msgs).find(([k]) => k.startsWith('relativity'));
  return (
    <fieldset class="relativity-input">
      <legend>Relativity (optional; the terms need the distance)</legend>
      <div class="toolbar">
        {RELATIVITY_SWITCHES.map((s) => (
          <label class="inline" key={s}>
            <input
              type="checkbox"
              name={`relativity-${s}`}
              checked={!!draft.relativity[s]}
              onChange={(e) =>
                set({ relativity: { ...draft.relativity, [s]: e.currentTarget.checked } })
              }
            />{' '}
            {RELATIVITY_WORDS[s]}
          </label>
        ))}
      </div>
      <div class="field-grid">
        {FACTORS.map((f) => (
          <label class="field" key={f.key}>
            <span>{f.label}</span>
            <input
              name={`factor-${f.key}`}
              placeholder="1"
              aria-invalid={!!msgs[`relativityFactors.${f.key}`]}
              value={draft.factors[f.key] ?? ''}
              onInput={(e) =>
                set({ factors: { ...draft.factors, [f.key]: e.currentTarget.value } })
              }
            />
            {msgs[`relativityFactors.${f.key}`] && (
              <span class="field-msg">{msgs[`relativityFactors.${f.key}`]}</span>
            )}
          </label>
        ))}
      </div>
      {fieldMsg && !fieldMsg[0].startsWith('relativityFactors.') && (
        <p class="field-msg">{fieldMsg[1]}</p>
      )}
    </fieldset>
  );
}
