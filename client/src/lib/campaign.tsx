/**
 * The campaign a person has chosen, carried across views and reloads: kept in localStorage, so
 * the Season and Nights views open on the campaign picked on the Campaign view, and back.
 */
import { useEffect, useState } from 'preact/hooks';
import type { CampaignRow } from '../api/client.ts';

const KEY = 'ew.campaign';
const listeners = new Set<(id: number | null) => void>();

function stored(): number | null {
  const n = Number(localStorage.getItem(KEY));
  return Number.isInteger(n) && n > 0 ? n : null;
}

/** The chosen campaign among `campaigns` (the first when none is chosen or it is gone), and its setter. */
export function useChosenCampaign(
  campaigns: readonly CampaignRow[] | undefined,
): [CampaignRow | undefined, (id: number) => void] {
  const [id, setId] = useState<number | null>(stored);
  useEffect(() => {
    listeners.add(setId);
    return () => void listeners.delete(setId);
  }, []);
  const choose = (next: number) => {
    localStorage.setItem(KEY, String(next));
    for (const f of listeners) f(next);
  };
  return [campaigns?.find((c) => c.id === id) ?? campaigns?.[0], choose];
}

/** The campaign chooser every campaign view shows (its choice carries to the others). */
export function CampaignChoice(p: {
  campaigns: readonly CampaignRow[];
  value: number;
  onChoose: (id: number) => void;
}) {
  return (
    <label class="inline">
      Campaign{' '}
      <select
        name="campaign"
        value={p.value}
        onChange={(e) => p.onChoose(Number(e.currentTarget.value))}
      >
        {p.campaigns.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </select>
    </label>
  );
}
