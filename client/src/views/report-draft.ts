/**
 * Night-report drafts live in localStorage from the first keystroke until the server confirms a
 * save, so a dropped connection, a crash or a closed tab loses nothing. A draft remembers which
 * stored version it was started from; that version goes with the save, so an edit made meanwhile
 * by someone else is detected (409) instead of silently overwritten.
 */
import type { Outcome, ReportRow } from '../api/client.ts';

/** What a report sends per block (the stored outcome without its ids). */
type OutcomeBody = Pick<Outcome, 'blockId' | 'status' | 'exposureMinutes' | 'notes'>;
const STATUSES: readonly Outcome['status'][] = [
  'obtained',
  'partial',
  'lost',
  'withdrawn',
  'planned',
];

export const CONDITION_FIELDS = [
  {
    key: 'seeingArcsec',
    label: 'seeing FWHM at zenith',
    unit: 'arcsec',
    min: 0,
    max: 20,
    step: 0.01,
  },
  {
    key: 'strehlRatio',
    label: 'adaptive-optics Strehl ratio',
    unit: '0–1',
    min: 0,
    max: 1,
    step: 0.01,
  },
  { key: 'cloudCoverPct', label: 'cloud cover', unit: '%', min: 0, max: 100, step: 1 },
  { key: 'humidityPct', label: 'relative humidity', unit: '%', min: 0, max: 100, step: 1 },
  { key: 'windMS', label: 'wind speed', unit: 'm/s', min: 0, max: 100, step: 0.1 },
  { key: 'temperatureC', label: 'temperature', unit: '°C', min: -60, max: 50, step: 0.1 },
  { key: 'timeLostHours', label: 'time lost', unit: 'h', min: 0, max: 24, step: 0.1 },
] as const;
export type ConditionKey = (typeof CONDITION_FIELDS)[number]['key'];

/** What the form edits: numbers as typed (strings), so a half-typed value survives a reload. */
export interface ReportForm {
  conditions: Record<ConditionKey, string>;
  timeLostReason: string;
  notes: string;
  outcomes: Record<number, { status: string; exposureMinutes: string; notes: string }>;
}

export interface Draft {
  nightId: number;
  /** The stored report and version this draft was started from (null: a new report). */
  base: { id: number; version: number } | null;
  form: ReportForm;
  savedAt: string;
}

const key = (nightId: number) => `ew.draft.report.${nightId}`;

export function readDraft(nightId: number): Draft | null {
  try {
    const raw = localStorage.getItem(key(nightId));
    return raw ? (JSON.parse(raw) as Draft) : null;
  } catch {
    return null;
  }
}
export const writeDraft = (d: Draft) => localStorage.setItem(key(d.nightId), JSON.stringify(d));
export const dropDraft = (nightId: number) => localStorage.removeItem(key(nightId));

const str = (v: number | null | undefined) => (v === null || v === undefined ? '' : String(v));

/**
 * The form for a stored report (or an empty one), with an outcome row for every block of the night.
 * A block the report does not mention yet starts from the status it was logged with, if not a plan.
 */
export function formOf(
  report: ReportRow | null,
  blockIds: number[],
  loggedStatus: Record<number, string> = {},
): ReportForm {
  const conditions = Object.fromEntries(
    CONDITION_FIELDS.map((f) => [f.key, str(report?.[f.key])]),
  ) as Record<ConditionKey, string>;
  const outcomes: ReportForm['outcomes'] = {};
  for (const id of blockIds) {
    const o = report?.outcomes.find((x) => x.blockId === id);
    outcomes[id] = {
      status: o?.status ?? (loggedStatus[id] === 'planned' ? '' : (loggedStatus[id] ?? '')),
      exposureMinutes: str(o?.exposureMinutes),
      notes: o?.notes ?? '',
    };
  }
  return {
    conditions,
    timeLostReason: report?.timeLostReason ?? '',
    notes: report?.notes ?? '',
    outcomes,
  };
}

/** Condition fields whose text is not a plain number, with the rule in words (a decimal comma names its fix). */
export function numberProblems(form: ReportForm): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of CONDITION_FIELDS) {
    const t = form.conditions[f.key].trim();
    if (t === '' || /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) continue;
    out[f.key] = /^[+-]?\d*,\d+$/.test(t)
      ? `“${t}” has a comma: use a decimal point: ${t.replace(',', '.')}`
      : `“${t}” is not a number`;
  }
  return out;
}

/** The request body for a form: empty number fields become null; blocks without a status are not reported. */
export function bodyOf(form: ReportForm) {
  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  const conditions = Object.fromEntries(
    CONDITION_FIELDS.map((f) => [f.key, num(form.conditions[f.key])]),
  ) as Record<ConditionKey, number | null>;
  const outcomes: OutcomeBody[] = Object.entries(form.outcomes).flatMap(([id, o]) => {
    const status = STATUSES.find((s) => s === o.status);
    return status === undefined
      ? []
      : [
          {
            blockId: Number(id),
            status,
            exposureMinutes: num(o.exposureMinutes),
            notes: o.notes,
          },
        ];
  });
  return {
    ...conditions,
    timeLostHours: num(form.conditions.timeLostHours) ?? 0,
    timeLostReason: form.timeLostReason,
    notes: form.notes,
    outcomes,
  };
}

/** Fields whose values differ between two forms, as [path, mine, theirs] for the conflict view. */
export function differences(
  mine: ReportForm,
  theirs: ReportForm,
): { path: string; label: string; mine: string; theirs: string }[] {
  const out: { path: string; label: string; mine: string; theirs: string }[] = [];
  for (const f of CONDITION_FIELDS)
    if (mine.conditions[f.key] !== theirs.conditions[f.key])
      out.push({
        path: `conditions.${f.key}`,
        label: `${f.label} (${f.unit})`,
        mine: mine.conditions[f.key],
        theirs: theirs.conditions[f.key],
      });
  if (mine.timeLostReason !== theirs.timeLostReason)
    out.push({
      path: 'timeLostReason',
      label: 'why time was lost',
      mine: mine.timeLostReason,
      theirs: theirs.timeLostReason,
    });
  if (mine.notes !== theirs.notes)
    out.push({ path: 'notes', label: 'notes', mine: mine.notes, theirs: theirs.notes });
  for (const id of new Set([...Object.keys(mine.outcomes), ...Object.keys(theirs.outcomes)])) {
    const a = mine.outcomes[Number(id)];
    const b = theirs.outcomes[Number(id)];
    const show = (o: typeof a) =>
      o?.status
        ? `${o.status}${o.exposureMinutes ? `, ${o.exposureMinutes} min` : ''}${o.notes ? `, “${o.notes}”` : ''}`
        : '(none)';
    if (show(a) !== show(b))
      out.push({
        path: `outcomes.${id}`,
        label: `block ${id} outcome`,
        mine: show(a),
        theirs: show(b),
      });
  }
  return out;
}

/** Take the chosen side of each differing field. */
export function merge(
  mine: ReportForm,
  theirs: ReportForm,
  pick: Record<string, 'mine' | 'theirs'>,
): ReportForm {
  const out: ReportForm = structuredClone(mine);
  for (const [path, side] of Object.entries(pick)) {
    if (side === 'mine') continue;
    const [head, rest] = path.split('.') as [string, string | undefined];
    if (head === 'conditions' && rest)
      out.conditions[rest as ConditionKey] = theirs.conditions[rest as ConditionKey];
    else if (head === 'outcomes' && rest) {
      const o = theirs.outcomes[Number(rest)];
      if (o) out.outcomes[Number(rest)] = { ...o };
      else delete out.outcomes[Number(rest)];
    } else if (head === 'timeLostReason') out.timeLostReason = theirs.timeLostReason;
    else if (head === 'notes') out.notes = theirs.notes;
  }
  return out;
}
