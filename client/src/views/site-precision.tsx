/**
 * The precision a site's measurements reached: per instrument and kind the median σ, by seeing and
 * by airmass, and the σ implied at the zenith; and seeing and airmass together where both are known.
 */
import type { Schemas } from '../api/client.ts';
import { Blank, Qty, Section } from '../lib/ui.tsx';

type Precision = Schemas['SiteStatistics']['precision'][number];

export function PrecisionSection({ precision }: { precision: Precision[] }) {
  return (
    <Section title="Precision reached" id="site-precision">
      {precision.length === 0 ? (
        <p class="muted">No measurement is linked to a block at this site yet.</p>
      ) : (
        <table class="data site-precision">
          <thead>
            <tr>
              <th>instrument</th>
              <th>kind</th>
              <th>measurements</th>
              <th>median σ</th>
              <th>by seeing</th>
              <th>by airmass</th>
              <th>implied zenith σ</th>
            </tr>
          </thead>
          <tbody>
            {precision.map((p) => (
              <PrecisionLine key={`${p.kind} ${p.instrument}`} p={p} />
            ))}
          </tbody>
        </table>
      )}
      {precision
        .filter((p) => p.bySeeingAndAirmass.some((r) => r.byAirmass.some((c) => c.n > 0)))
        .map((p) => (
          <JointPrecision key={`joint ${p.kind} ${p.instrument}`} p={p} />
        ))}
      <p class="muted">
        Implied zenith σ: the median of σ scaled to the zenith (X^0.6) and to the median seeing —
        the planner’s precision model, read back from what was reached.
      </p>
    </Section>
  );
}

function PrecisionLine({ p }: { p: Precision }) {
  return (
    <tr>
      <td>{p.instrument}</td>
      <td>{p.kind}</td>
      <td>{p.n}</td>
      <td>
        <Qty v={p.medianSigma} unit={p.unit} digits={2} />
      </td>
      <td>
        {p.bySeeing
          .filter((b) => b.n > 0)
          .map((b) => `${b.low}–${b.high ?? ''}″: ${b.medianSigma?.toFixed(2)} (${b.n})`)
          .join('; ') || <Blank why="no night report of these measurements gives the seeing" />}
      </td>
      <td>
        {p.byAirmass
          .filter((b) => b.n > 0)
          .map((b) => `${b.low}–${b.high ?? ''}: ${b.medianSigma?.toFixed(2)} (${b.n})`)
          .join('; ') || (
          <Blank why="their target was below the horizon at every one of these measurements" />
        )}
      </td>
      <td>
        {p.zenith
          ? `${p.zenith.sigma.toFixed(2)} ${p.unit} at ${p.zenith.referenceSeeingArcsec.toFixed(2)}″ seeing ` +
            `(${p.zenith.n})`
          : 'needs seeing in the night reports'}
      </td>
    </tr>
  );
}

/** Median σ and the count in each seeing × airmass bin, for one instrument and kind. */
function JointPrecision({ p }: { p: Precision }) {
  return (
    <table class="joint-precision">
      <caption>
        {p.instrument}, {p.kind}: median σ ({p.unit}) and measurements, by seeing and airmass
        together
      </caption>
      <thead>
        <tr>
          <th>seeing \ airmass</th>
          {p.bySeeingAndAirmass[0]!.byAirmass.map((c) => (
            <th key={c.low}>{c.high === null ? `≥ ${c.low}` : `${c.low}–${c.high}`}</th>
          ))}
        </tr>
      </thead>
      <tbody>
        {p.bySeeingAndAirmass.map((r) => (
          <tr key={r.seeingLow}>
            <th>
              {r.seeingHigh === null ? `≥ ${r.seeingLow}″` : `${r.seeingLow}–${r.seeingHigh}″`}
            </th>
            {r.byAirmass.map((c) => (
              <td key={c.low}>
                {c.n > 0 && c.medianSigma !== null ? (
                  `${c.medianSigma.toFixed(2)} (${c.n})`
                ) : (
                  <Blank why="no measurement in this seeing and airmass bin" />
                )}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
