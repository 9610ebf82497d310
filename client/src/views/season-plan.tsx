/**
 * Review a proposed season plan for the campaign (epochs per target and site, why each was chosen,
 * goals it cannot meet and why, how much it should tighten the orbit) and, as a lead, accept it
 * into stored blocks. The proposal is drawn on the season charts above.
 */
import { useState } from 'preact/hooks';
import { ApiError, fieldMessages, api, type Schemas } from '../api/client.ts';
import type { CampaignRow } from '../api/client.ts';
import { utcClock } from '../lib/time.ts';
import { Caution, ErrorLine, Qty, Section, useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';
import { plural } from '../lib/words.ts';
import { ForecastSummary, ForecastTable } from './forecast-panel.tsx';
import { SeasonDrawsPanel } from './season-draws.tsx';

export type SeasonPlanPreview = Schemas['SeasonPlanPreview'];

const pct = (x: number) => `${Math.round(100 * x)} %`;
const utcDay = (iso: string) => iso.slice(0, 10);
type PlanRequest = {
  startDate: string;
  endDate: string;
  nights: 'allocated' | 'all';
  weather: 'aware' | 'blind';
  relativityGoal: boolean;
};
type Plan = SeasonPlanPreview['plan'];
type PlanTarget = Plan['targets'][number];
type FieldMsgs = ReturnType<typeof fieldMessages>;

/** The form's first request: the year's nights from today on, within the campaign's dates. */
function initialRequest(campaign: CampaignRow, year: number): PlanRequest {
  const today = new Date().toISOString().slice(0, 10);
  const clamp = (d: string) =>
    d < campaign.startDate ? campaign.startDate : d > campaign.endDate ? campaign.endDate : d;
  return {
    startDate: clamp(today > `${year}-01-01` ? today : `${year}-01-01`),
    endDate: clamp(`${year}-12-31`),
    nights: 'allocated',
    weather: 'aware',
    relativityGoal: campaign.goals.relativityGoal ?? false,
  };
}

function acceptedWords(r: { written: unknown[]; nightsCreated: unknown[] }, replaced: number) {
  const stored = plural(r.written.length, 'block');
  const created = plural(r.nightsCreated.length, 'night');
  return `Accepted: ${stored} stored, ${created} created, ${plural(replaced, 'planned block')} replaced.`;
}

/** A 409 means the plan changed under the review (its digest no longer matches): say what to do. */
const staleProposal = (e: unknown) =>
  e instanceof ApiError && e.status === 409
    ? new Error(`${e.message}. Propose again to review the plan as it now comes out.`)
    : e;

export function SeasonPlanPanel(props: {
  campaign: CampaignRow;
  year: number;
  onProposal: (p: SeasonPlanPreview | null) => void;
  onAccepted: () => void;
}) {
  const { campaign, onProposal, onAccepted } = props;
  const lead = useCan('lead');
  const [form, setForm] = useState(() => initialRequest(campaign, props.year));
  const [preview, setPreview] = useState<SeasonPlanPreview | null>(null);
  /** Whether the preview shown was asked with the relativity goal (the form may have changed since). */
  const [proposedGoal, setProposedGoal] = useState(false);
  const { busy, error, run } = useAction();
  const [status, setStatus] = useState('');
  const propose = () =>
    run(async () => {
      setStatus('');
      const p = await api.POST('/campaigns/{id}/season-plan', {
        params: { path: { id: campaign.id } },
        body: form,
      });
      setPreview(p);
      setProposedGoal(form.relativityGoal);
      onProposal(p);
    });
  const discard = () => {
    setPreview(null);
    onProposal(null);
  };
  // Accepting sends the reviewed plan's digest: the server refuses if the plan would now differ.
  const accept = async () => {
    if (!preview) return;
    await run(async () => {
      const r = await api.POST('/campaigns/{id}/season-plan/accept', {
        params: { path: { id: campaign.id } },
        body: { ...form, digest: preview.digest },
      });
      setStatus(acceptedWords(r, preview.replaces.length));
      discard();
      onAccepted();
    }, staleProposal);
  };
  return (
    <Section title="Season plan" id="season-plan">
      <form
        class="row-form"
        onSubmit={(e) => {
          e.preventDefault();
          propose();
        }}
      >
        <PlanRequestFields form={form} onForm={setForm} msgs={fieldMessages(error)} />
        <PlanButtons
          busy={busy}
          reviewing={preview !== null}
          lead={lead}
          onAccept={accept}
          onDiscard={discard}
        />
      </form>
      {status && (
        <p class="notice" role="status">
          {status}
        </p>
      )}
      <ErrorLine error={error} />
      {preview && (
        <PlanProposal
          preview={preview}
          campaignId={campaign.id}
          request={form}
          lead={lead}
          proposedGoal={proposedGoal}
        />
      )}
    </Section>
  );
}

/** Propose always; a proposal under review can be discarded or (by a lead) accepted. */
function PlanButtons(p: {
  busy: boolean;
  reviewing: boolean;
  lead: boolean;
  onAccept: () => void;
  onDiscard: () => void;
}) {
  return (
    <>
      <button type="submit" class="primary" disabled={p.busy}>
        Propose a season plan
      </button>
      {p.reviewing && p.lead && (
        <button type="button" disabled={p.busy} onClick={p.onAccept}>
          Accept into blocks
        </button>
      )}
      {p.reviewing && (
        <button type="button" disabled={p.busy} onClick={p.onDiscard}>
          Discard
        </button>
      )}
      {p.busy && <span class="loading">planning…</span>}
    </>
  );
}

/** The range, which nights, the weather rule and the relativity goal. */
function PlanRequestFields({
  form,
  onForm: setForm,
  msgs,
}: {
  form: PlanRequest;
  onForm: (f: PlanRequest) => void;
  msgs: FieldMsgs;
}) {
  return (
    <>
      <PlanNight field="startDate" label="first night" form={form} onForm={setForm} msgs={msgs} />
      <PlanNight field="endDate" label="last night" form={form} onForm={setForm} msgs={msgs} />
      <label>
        nights{' '}
        <select
          name="nights"
          value={form.nights}
          onChange={(e) =>
            setForm({ ...form, nights: e.currentTarget.value === 'all' ? 'all' : 'allocated' })
          }
        >
          <option value="allocated">the campaign’s allocated nights</option>
          <option value="all">every night of the range</option>
        </select>
      </label>
      <label>
        weather{' '}
        <select
          name="weather"
          value={form.weather}
          onChange={(e) =>
            setForm({ ...form, weather: e.currentTarget.value === 'aware' ? 'aware' : 'blind' })
          }
        >
          <option value="aware">
            weigh nights by their chance of being clear, back up critical epochs
          </option>
          <option value="blind">every night counts as clear</option>
        </select>
      </label>
      <label>
        <input
          type="checkbox"
          name="relativityGoal"
          checked={form.relativityGoal}
          onChange={(e) => setForm({ ...form, relativityGoal: e.currentTarget.checked })}
        />{' '}
        also pick the epochs that most sharpen the redshift and precession factors
      </label>
    </>
  );
}

/** One end of the range, a local date, with the server's message for it. */
function PlanNight(p: {
  field: 'startDate' | 'endDate';
  label: string;
  form: PlanRequest;
  onForm: (f: PlanRequest) => void;
  msgs: FieldMsgs;
}) {
  const { field, form, msgs } = p;
  return (
    <label>
      {p.label} (local date){' '}
      <input
        type="date"
        name={field}
        value={form[field]}
        onInput={(e) => p.onForm({ ...form, [field]: e.currentTarget.value })}
      />
      {msgs[field] && <span class="field-msg">{msgs[field]}</span>}
    </label>
  );
}

/** A proposal under review: its cautions and size, the sampled outcomes, then each table. */
function PlanProposal({
  preview,
  campaignId,
  request,
  lead,
  proposedGoal,
}: {
  preview: SeasonPlanPreview;
  campaignId: number;
  request: PlanRequest;
  lead: boolean;
  proposedGoal: boolean;
}) {
  const p = preview.plan;
  return (
    <>
      {p.cautions.map((c) => (
        <Caution key={c}>{c}</Caution>
      ))}
      <p>
        {plural(p.epochs.length, 'epoch')} proposed; accepting replaces{' '}
        {plural(preview.replaces.length, 'block')}
        that are still only plans{lead ? '' : ' (accepting needs the lead role)'}.
      </p>
      <SeasonDrawsPanel campaignId={campaignId} request={request} />
      <PlanSitesTable preview={preview} />
      <PlanTargetsTable plan={p} />
      <PlanRelativity plan={p} proposedGoal={proposedGoal} />
      <PlanBackups plan={p} />
      <PeriapsisWindows plan={p} />
      <PlanEpochs plan={p} />
      <UnmetGoals plan={p} />
    </>
  );
}

/** Per site: nights open and used, hours, and the nights skipped or planned around, with why. */
function PlanSitesTable({ preview }: { preview: SeasonPlanPreview }) {
  const p = preview.plan;
  return (
    <table class="data">
      <thead>
        <tr>
          <th>site</th>
          <th>open nights</th>
          <th>nights used</th>
          <th>planned (h)</th>
          <th>darkness (h)</th>
          <th>nights skipped</th>
          <th>planned around blocks that stay</th>
        </tr>
      </thead>
      <tbody>
        {p.sites.map((s) => {
          const meta = preview.sites.find((m) => m.name === s.name);
          return (
            <tr key={s.name}>
              <td>{s.name}</td>
              <td>{s.nights}</td>
              <td>{s.nightsUsed}</td>
              <td>
                <Qty v={s.plannedHours} unit="" />
              </td>
              <td>
                <Qty v={s.darkHours} unit="" />
              </td>
              <td>{meta?.skipped.map((k) => `${k.date} (${k.reason})`).join('; ') || '–'}</td>
              <td>
                {meta?.plannedAround
                  .map(
                    (n) =>
                      `${n.date}: ${n.kept.map((k) => `block ${k.id} (${k.reason})`).join(', ')}`,
                  )
                  .join('; ') || '–'}
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

function PlanTargetsTable({ plan: p }: { plan: Plan }) {
  return (
    <table class="data">
      <thead>
        <tr>
          <th>target</th>
          <th>priority</th>
          <th>cadence (d)</th>
          <th>epochs</th>
          <th>cadence met</th>
          <th>coming periapsis</th>
          <th>its date σ (d), before → after</th>
          <th>coverage, before → after</th>
          <th>mass σ (%), before → after</th>
        </tr>
      </thead>
      <tbody>
        {p.targets.map((t) => (
          <TargetRow key={t.target} t={t} />
        ))}
      </tbody>
    </table>
  );
}

const coverageWords = (c: { before: number; after: number; withinDays: number }) =>
  `${pct(c.before)} → ${pct(c.after)} within ${c.withinDays} d`;

/** One target's epochs and what the plan does to its coming periapsis and mass. */
function TargetRow({ t }: { t: PlanTarget }) {
  return (
    <tr>
      <td>{t.target}</td>
      <td>{t.priority}</td>
      <td>{t.cadenceDays}</td>
      <td>
        {Object.entries(t.epochs)
          .map(([k, n]) => `${n} ${k}`)
          .join(', ')}
      </td>
      <td>{t.cadenceMet ? 'yes' : 'no'}</td>
      <td>{t.shrinkage?.passage ? utcDay(t.shrinkage.passage) : '–'}</td>
      <td>
        {t.shrinkage?.passage ? (
          <>
            <Qty v={t.shrinkage.periapsisDays.before} unit="" digits={2} /> →{' '}
            <Qty v={t.shrinkage.periapsisDays.after} unit="" digits={2} />
            {t.shrinkage.nominalPrior && <span class="muted"> (no covariance: nominal prior)</span>}
          </>
        ) : (
          '–'
        )}
      </td>
      <td>{t.passage ? coverageWords(t.passage.coverage) : '–'}</td>
      <td>
        {t.shrinkage?.massFraction.before != null ? (
          <>
            <Qty v={t.shrinkage.massFraction.before * 100} unit="" digits={2} /> →{' '}
            <Qty v={(t.shrinkage.massFraction.after ?? 0) * 100} unit="" digits={2} />
          </>
        ) : (
          '–'
        )}
      </td>
    </tr>
  );
}

const CAPTION_REST = "the blocks that stay and this plan's, each at its expected σ.";

function PlanRelativity({ plan: p, proposedGoal }: { plan: Plan; proposedGoal: boolean }) {
  if (!p.targets.some((t) => t.relativity)) return null;
  return (
    <div class="plan-relativity" data-goal={String(proposedGoal)}>
      <h3>
        Relativity forecast after this plan
        {proposedGoal ? ', its epochs chosen for it too' : ''}
      </h3>
      {p.targets.map((t) =>
        t.relativity ? (
          <div key={t.target} data-target={t.target}>
            <h4>{t.target}</h4>
            <ForecastSummary forecast={t.relativity} />
            <ForecastTable
              forecast={t.relativity}
              caption={`Its measurements, then ${plural(t.relativity.plannedEpochs, 'epoch')}: ${CAPTION_REST}`}
            />
          </div>
        ) : null,
      )}
    </div>
  );
}

function PlanBackups({ plan: p }: { plan: Plan }) {
  const shown = p.targets.filter((t) => t.backups && (t.backups.critical > 0 || t.passage));
  if (shown.length === 0) return null;
  return (
    <div class="plan-backups">
      <h3>Against the weather: critical epochs and their backups</h3>
      <ul>
        {shown.map((t) => (
          <li key={t.target} data-target={t.target}>
            <strong>{t.target}</strong>: {t.backups!.words}.
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Each coming periapsis: its window, the epochs in it and every allocated night left unused. */
function PeriapsisWindows({ plan: p }: { plan: Plan }) {
  if (!p.targets.some((t) => t.passage)) return null;
  return (
    <details class="periapsis-windows">
      <summary>
        Periapsis windows: epochs in each, and every allocated night left unused with why
      </summary>
      <ul>
        {p.targets.map((t) =>
          t.passage ? (
            <li key={t.target}>
              <strong>{t.target}</strong> passes periapsis {utcDay(t.passage.date)} (window ±{' '}
              {t.passage.windowSigma} σ: {utcDay(t.passage.windowStart)} to{' '}
              {utcDay(t.passage.windowEnd)}), {t.passage.epochs} epochs in it
              {t.passage.unused.length > 0 && (
                <ul>
                  {t.passage.unused.map((n) => (
                    <li key={`${n.site}${n.date}${n.kind}`}>
                      unused: {n.site} {n.date} {n.kind}: {n.words}
                    </li>
                  ))}
                </ul>
              )}
            </li>
          ) : null,
        )}
      </ul>
    </details>
  );
}

function PlanEpochs({ plan: p }: { plan: Plan }) {
  return (
    <details>
      <summary>{p.epochs.length} proposed epochs, with the reason for each</summary>
      <div class="scroll">
        <table class="data epochs">
          <thead>
            <tr>
              <th>night</th>
              <th>site</th>
              <th>target</th>
              <th>kind</th>
              <th>UTC</th>
              <th>expected σ</th>
              <th>gain</th>
              <th>why</th>
            </tr>
          </thead>
          <tbody>
            {p.epochs.map((e) => (
              <tr key={e.block.id}>
                <td>{e.date}</td>
                <td>{e.site}</td>
                <td>{e.target}</td>
                <td>
                  {e.kind}
                  {e.block.laserGuideStar && <span class="tag lgs-tag">laser</span>}
                </td>
                <td>
                  {utcClock(e.block.start.utc)}–{utcClock(e.block.end.utc)}
                </td>
                <td>
                  {e.precision.sigma.toFixed(e.precision.unit === 'mas' ? 2 : 1)} {e.precision.unit}{' '}
                  at airmass {e.precision.airmass.toFixed(2)}
                </td>
                <td>{e.gain.text}</td>
                <td>{e.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}

function UnmetGoals({ plan: p }: { plan: Plan }) {
  if (p.unmet.length === 0) return <p class="muted">Every goal is met.</p>;
  return (
    <details>
      <summary>
        {p.unmet.length} goal{p.unmet.length === 1 ? '' : 's'} the plan cannot meet, with the reason
        for each
      </summary>
      <ul class="unmet">
        {p.unmet.map((u, i) => (
          <li key={i}>
            <strong>
              {u.target} {u.kind}
            </strong>
            , {u.start} to {u.end}: {u.reason}
          </li>
        ))}
      </ul>
    </details>
  );
}
