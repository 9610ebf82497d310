/** The orbit-solution form's first row: whose solution, its reference, and whether it becomes current. */
import type { Catalogue } from '../api/catalogue.ts';

export interface SolutionHead {
  targetId: string;
  reference: string;
  makeCurrent: boolean;
}

export function SolutionHeader({
  cat,
  head,
  setHead,
}: {
  cat: Catalogue;
  head: SolutionHead;
  setHead: (h: SolutionHead) => void;
}) {
  return (
    <div class="field-grid">
      <label class="field">
        <span>target</span>
        <select
          name="targetId"
          value={head.targetId}
          onChange={(e) => setHead({ ...head, targetId: e.currentTarget.value })}
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
          value={head.reference}
          onInput={(e) => setHead({ ...head, reference: e.currentTarget.value })}
        />
      </label>
      <label class="field">
        <span>make it the target’s current solution</span>
        <input
          type="checkbox"
          name="makeCurrent"
          checked={head.makeCurrent}
          onChange={(e) => setHead({ ...head, makeCurrent: e.currentTarget.checked })}
        />
      </label>
    </div>
  );
}
