/**
 * Everything out of the store from the client: the measurements as CSV (the import layout), a
 * campaign's calendar (iCalendar), and, for a lead, the archive of every record, which
 * `epochwright restore --archive` reads into an empty database. (Orbit solutions: OrbitExport.)
 */
import { useState } from 'preact/hooks';
import { downloadFile } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import { CampaignChoice, useChosenCampaign } from '../lib/campaign.tsx';
import { ErrorLine, useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';

/** A file name from a record's name: "Vesper Core passage 2027" → "vesper-core-passage-2027". */
const slug = (name: string) =>
  name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '') || 'records';

export function RecordExports({ cat }: { cat: Catalogue }) {
  const lead = useCan('lead');
  const [targetId, setTargetId] = useState('');
  const [campaign, choose] = useChosenCampaign(cat.campaigns);
  const { busy, error, run } = useAction();
  const target = cat.targets.find((t) => String(t.id) === targetId);
  /** A button that saves one export under `name`. */
  const save = (label: string, fetch: () => Promise<void>) => (
    <button type="button" disabled={busy} onClick={() => run(fetch)}>
      {label}
    </button>
  );
  return (
    <div class="record-exports">
      <div class="toolbar">
        <label class="inline">
          measurements of{' '}
          <select
            name="export-target"
            value={targetId}
            onChange={(e) => setTargetId(e.currentTarget.value)}
          >
            <option value="">every target</option>
            {cat.targets.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </label>
        {save('Download measurements (CSV)', () =>
          downloadFile(
            '/exports/measurements',
            { params: { query: target ? { targetId: target.id } : {} } },
            `${target ? slug(target.name) : 'all'}-measurements.csv`,
          ),
        )}
      </div>
      {campaign && (
        <div class="toolbar">
          <CampaignChoice campaigns={cat.campaigns} value={campaign.id} onChoose={choose} />
          {save('Download its calendar (iCalendar)', () =>
            downloadFile(
              '/campaigns/{id}/calendar.ics',
              { params: { path: { id: campaign.id } } },
              `${slug(campaign.name)}.ics`,
              'text/calendar',
            ),
          )}
        </div>
      )}
      {lead ? (
        <div class="toolbar">
          {save('Download the archive of every record (JSON)', () =>
            downloadFile('/exports/archive', {}, 'epochwright-archive.json', 'application/json'),
          )}
          <span class="muted">
            Systems, targets, solutions with covariance and provenance, sites, campaigns, nights,
            blocks, reports, measurements, users and the audit trail (no tokens); restore it into an
            empty database with <code>epochwright restore --archive FILE</code>.
          </span>
        </div>
      ) : (
        <p class="muted">The archive of every record holds the users: a lead downloads it.</p>
      )}
      <ErrorLine error={error} />
    </div>
  );
}
