/** Small shared pieces of the views: status lines, errors, numbers with units, the role gate. */
import { roleAtLeast } from '../../../descriptors/roles.ts';
import type { ComponentChildren } from 'preact';
import { createContext } from 'preact';
import { useContext, useEffect, useRef, useState } from 'preact/hooks';
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

/** An empty table cell that says why it is empty: a dash with the reason as its title. */
export function Blank({ why }: { why: string }) {
  return (
    <span class="blank" title={why}>
      –
    </span>
  );
}

/** A number with its unit, or an en dash when missing. */
export function Qty({
  v,
  unit,
  digits = 1,
  why,
}: {
  v: number | null | undefined;
  unit: string;
  digits?: number;
  /** Why it can be missing, shown as the dash's title. */
  why?: string;
}) {
  if (v === null || v === undefined || !Number.isFinite(v))
    return why ? <Blank why={why} /> : <span class="qty missing">–</span>;
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

/** The cautions a page has shown, by kind: each kind once per page (the view keys a scope by address). */
const CautionRegistry = createContext<Map<string, object> | null>(null);

export function CautionScope({ children }: { children: ComponentChildren }) {
  const [shown] = useState(() => new Map<string, object>());
  return <CautionRegistry.Provider value={shown}>{children}</CautionRegistry.Provider>;
}

const textOf = (c: ComponentChildren): string =>
  Array.isArray(c)
    ? c.map(textOf).join('')
    : typeof c === 'string' || typeof c === 'number'
      ? String(c)
      : '';

/**
 * Safety notes are shown verbatim and never hidden behind a toggle, once per page: every
 * laser-guide-star caution is one kind, any other caution is its own text.
 */
export function Caution({ children }: { children: ComponentChildren }) {
  const shown = useContext(CautionRegistry);
  const me = useRef({}).current;
  const text = textOf(children);
  const kind = /laser/i.test(text) ? 'laser guide star' : text;
  useEffect(
    () => () => {
      if (shown?.get(kind) === me) shown.delete(kind);
    },
    [kind],
  );
  if (shown) {
    const owner = shown.get(kind);
    if (!owner) shown.set(kind, me);
    else if (owner !== me) return null;
  }
  return (
    <p class="caution" role="note">
      <span class="caution-mark" aria-hidden="true">
        !
      </span>{' '}
      {children}
    </p>
  );
}
