/**
 * A new orbit solution typed in: Campbell elements or Thiele–Innes constants, each with its 1σ
 * and the correlations of the pairs that have one (or a pasted covariance), and the relativistic
 * terms. The server checks it with the same rules as every other path (the orbit engine's
 * validation: 422 naming the element), and the message lands beside the field it names.
 */
import { useState } from 'preact/hooks';
import { fieldMessages, sendRecord } from '../api/client.ts';
import { invalidateCatalogue, type Catalogue } from '../api/catalogue.ts';
import { ErrorLine } from '../lib/ui.tsx';
import { ElementKindChoice, ElementTable } from './solution-elements.tsx';
import { EMPTY_DRAFT, orbitOfDraft, type LocalProblem } from './solution-input.ts';
import { RelativityInput } from './solution-relativity.tsx';
import { SolutionHeader } from './solution-header.tsx';
import { UncertaintyInput } from './solution-uncertainty.tsx';

export function SolutionForm({ cat, onCreated }: { cat: Catalogue; onCreated: () => void }) {
  const [head, setHead] = useState({
    targetId: String(cat.targets[0]?.id ?? ''),
    reference: '',
    makeCurrent: true,
  });
  const [draft, setDraft] = useState(EMPTY_DRAFT);
  const set = (patch: Partial<typeof draft>) => setDraft({ ...draft, ...patch });
  const [error, setError] = useState<unknown>(null);
  const [local, setLocal] = useState<LocalProblem | null>(null);
  const [created, setCreated] = useState('');
  const server = fieldMessages(error);
  const msgs: Record<string, string> = {
    ...Object.fromEntries(Object.entries(server).map(([k, m]) => [k.replace(/^orbit\./, ''), m])),
    ...(local ? { [local.field]: local.rule } : {}),
  };
  const submit = async (e: Event) => {
    e.preventDefault();
    setError(null);
    setLocal(null);
    setCreated('');
    const built = orbitOfDraft(draft);
    if ('rule' in built) return setLocal(built);
    try {
      const row = await sendRecord('POST', '/orbit-solutions', {
        targetId: Number(head.targetId),
        orbit: built.orbit,
        reference: head.reference,
        makeCurrent: head.makeCurrent,
      });
      setCreated(`Stored as solution #${row.id}${head.makeCurrent ? ', now current' : ''}.`);
      invalidateCatalogue();
      onCreated();
    } catch (err) {
      setError(err);
    }
  };
  return (
    <form
      class="create-form solution-form"
      aria-label="New orbit solution"
      onSubmit={submit}
      noValidate
    >
      <fieldset>
        <legend>New orbit solution</legend>
        <SolutionHeader cat={cat} head={head} setHead={setHead} />
        <ElementKindChoice draft={draft} set={set} msgs={msgs} />
        <ElementTable draft={draft} set={set} msgs={msgs} />
        <UncertaintyInput draft={draft} set={set} msgs={msgs} />
        <RelativityInput draft={draft} set={set} msgs={msgs} />
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
