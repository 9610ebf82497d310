/**
 * The orbit solutions as a CSV file in the import layout: elements, a σ column per parameter and
 * the correlations cell from each stored covariance, so the file can be edited and imported back.
 */
import { useState } from 'preact/hooks';
import { downloadFile } from '../api/client.ts';
import { ErrorLine } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';

export function OrbitExport() {
  const [currentOnly, setCurrentOnly] = useState(false);
  const { busy, error, run } = useAction();
  const download = () =>
    run(() =>
      downloadFile(
        '/exports/orbits',
        { params: { query: { current: currentOnly ? 'true' : 'false' } } },
        currentOnly ? 'current-orbit-solutions.csv' : 'orbit-solutions.csv',
      ),
    );
  return (
    <div class="toolbar">
      <label class="inline">
        <input
          type="checkbox"
          checked={currentOnly}
          onChange={(e) => setCurrentOnly(e.currentTarget.checked)}
        />{' '}
        current versions only
      </label>
      <button type="button" onClick={download} disabled={busy}>
        Download as CSV (with σ and correlations)
      </button>
      <ErrorLine error={error} />
    </div>
  );
}
