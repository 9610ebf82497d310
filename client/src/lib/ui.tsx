/** Small shared pieces of the views: status lines, errors, numbers with units, the role gate. */
import { roleAtLeast } from '../../../descriptors/roles.ts';
import type { ComponentChildren } from 'preact';
import { createContext } from 'preact';
import { useContext } from 'preact/hooks';
import { problemLines } from './problems.ts';
import type { Me, Role } from '../api/client.ts';

export const MeContext = createContext<Me | null>(null);

/** True when the signed-in user has at least this role (the server checks again on every write). */
export function useCan(role: Role): boolean {
  const me = useContext(MeContext);
  return !!me && roleAtLeast(me.role, role);
}

export function ErrorLine({ error }: { error: unknown }) {
  if (!error) return null;
  const lines = problemLines(error);
  return (
    <div class="error-line" role="alert">
      {lines.map((l) => (
        <p key={l}>{l}</p>
      ))}
    </div>
  );
}

export function Loading({ what }: { what: string }) {
  return (
    <p class="loading" aria-live="polite">
      Loading {what}…
    </p>
  );
}

/** A number with its unit, or an en dash when missing. */
export function Qty({
  v,
  unit,
  digits = 1,
}: {
  v: number | null | undefined;
  unit: string;
  digits?: number;
}) {
  if (v === null || v === undefined || !Number.isFinite(v))
    return <span class="qty missing">–</span>;
  return (
    <span class="qty">
      {v.toFixed(digits)}
      {unit ? (
        <span class="unit">{unit.startsWith('°') || unit === '%' ? unit : ` ${unit}`}</span>
      ) : null}
    </span>
  );
}

export function Section({
  title,
  children,
  id,
}: {
  title: string;
  children: ComponentChildren;
  id?: string;
}) {
  return (
    <section class="panel" id={id} aria-labelledby={id ? `${id}-h` : undefined}>
      <h2 id={id ? `${id}-h` : undefined}>{title}</h2>
      {children}
    </section>
  );
}

/** Safety notes are shown verbatim and never hidden behind a toggle. */
export function Caution({ children }: { children: ComponentChildren }) {
  return (
    <p class="caution" role="note">
      <span class="caution-mark" aria-hidden="true">
        !
      </span>{' '}
      {children}
    </p>
  );
}
