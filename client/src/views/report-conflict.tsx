/** Both versions side by side after a save met a newer stored report; the writer picks per field. */
import { useState } from 'preact/hooks';
import { differences, merge, type ReportForm } from './report-draft.ts';

export function ReportConflict({
  mine,
  theirs,
  theirsVersion,
  onResolve,
  onTakeTheirs,
}: {
  mine: ReportForm;
  theirs: ReportForm;
  theirsVersion: number;
  onResolve: (merged: ReportForm) => void;
  onTakeTheirs: () => void;
}) {
  const diffs = differences(mine, theirs);
  const [pick, setPick] = useState<Record<string, 'mine' | 'theirs'>>(
    Object.fromEntries(diffs.map((d) => [d.path, 'mine'])),
  );
  return (
    <section class="conflict" role="alertdialog" aria-labelledby="conflict-h">
      <h3 id="conflict-h">
        Someone saved this report while you were writing (now version {theirsVersion})
      </h3>
      <p>
        Nothing is lost: your text is still in this browser. Choose, field by field, which value to
        keep, then save.
      </p>
      <table class="data">
        <thead>
          <tr>
            <th>field</th>
            <th>yours (this browser)</th>
            <th>stored (version {theirsVersion})</th>
          </tr>
        </thead>
        <tbody>
          {diffs.map((d) => (
            <tr key={d.path} data-field={d.path}>
              <th>{d.label}</th>
              <td>
                <label>
                  <input
                    type="radio"
                    name={`pick-${d.path}`}
                    value="mine"
                    checked={pick[d.path] === 'mine'}
                    onChange={() => setPick({ ...pick, [d.path]: 'mine' })}
                  />{' '}
                  {d.mine || '(empty)'}
                </label>
              </td>
              <td>
                <label>
                  <input
                    type="radio"
                    name={`pick-${d.path}`}
                    value="theirs"
                    checked={pick[d.path] === 'theirs'}
                    onChange={() => setPick({ ...pick, [d.path]: 'theirs' })}
                  />{' '}
                  {d.theirs || '(empty)'}
                </label>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {diffs.length === 0 && <p>The two versions agree on every field; saving again keeps them.</p>}
      <div class="toolbar">
        <button type="button" class="primary" onClick={() => onResolve(merge(mine, theirs, pick))}>
          Save with these choices
        </button>
        <button type="button" onClick={onTakeTheirs}>
          Keep the stored version, discard mine
        </button>
      </div>
    </section>
  );
}
