// One connection in depth: the plain sentence, what data stands behind it, and two charts
// (P(make) against layover with its band; the predictive distribution of the margin).
import type { ComponentChildren } from 'preact';
import { useMemo, useState } from 'preact/hooks';
import type { ConnectionCurve, ConnectionView, TripView } from '../../shared/api/analysis-schema';
import { makeCurveConfig, marginConfig, type ChartColors } from '../charts/chart-configs';
import { ChartCanvas } from '../charts/chart-canvas';
import { duration, legSummary, percent, percentRange } from '../app/format';
import { missSentence, routeDataSentence, targetSentence } from '../app/sentences';
import { flagWords } from '../state/trip-table';

export interface ConnectionDetailProps {
  readonly trip: TripView;
  readonly connection: ConnectionView;
  readonly curve: ConnectionCurve | null;
  readonly curveError: string | null;
  readonly colors: ChartColors;
  readonly target: number;
  readonly intervalLevel: number;
  readonly onClose: () => void;
}

/** The curve's point nearest to a layover. */
export function pointAt(curve: ConnectionCurve, layoverMinutes: number): ConnectionCurve['points'][number] | undefined {
  let best = curve.points[0];
  for (const p of curve.points) if (best && Math.abs(p.layoverMinutes - layoverMinutes) < Math.abs(best.layoverMinutes - layoverMinutes)) best = p;
  return best;
}

/** "What if the layover were longer?": reads P(make) off the curve for a layover the user picks. */
function WhatIf({ curve, intervalPercent }: { curve: ConnectionCurve; intervalPercent: number }) {
  const [layover, setLayover] = useState(curve.layoverMinutes);
  const first = curve.points[0]?.layoverMinutes ?? 0;
  const last = curve.points[curve.points.length - 1]?.layoverMinutes ?? first;
  const point = pointAt(curve, layover);
  if (!point) return null;
  return (
    <div class="what-if">
      <label>
        Try another layover: <strong>{duration(point.layoverMinutes)}</strong>
        <input type="range" min={first} max={last} step={1} value={layover} onInput={(e) => setLayover(Number((e.currentTarget as HTMLInputElement).value))} />
      </label>
      <p data-testid="what-if">
        With {point.layoverMinutes} minutes: {percent(point.p)} chance of making it ({intervalPercent}% credible interval {percentRange(point.lo, point.hi)}). {missSentence(point.p)}
      </p>
    </div>
  );
}

function Charts({ curve, colors, intervalPercent }: { curve: ConnectionCurve; colors: ChartColors; intervalPercent: number }) {
  const makeConfig = useMemo(() => makeCurveConfig(curve, colors, intervalPercent), [curve, colors, intervalPercent]);
  const marginChart = useMemo(() => marginConfig(curve, colors), [curve, colors]);
  const pMiss = curve.margin.filter((b) => b.marginMinutes < 0).reduce((s, b) => s + b.probability, 0);
  return (
    <>
      <figure>
        <figcaption>Chance of making it against the layover</figcaption>
        <ChartCanvas
          config={makeConfig}
          testId="make-curve-chart"
          description={`P(make) rises from ${percent(curve.points[0]?.p ?? null)} at ${curve.points[0]?.layoverMinutes ?? 0} minutes to ${percent(curve.points[curve.points.length - 1]?.p ?? null)} at ${curve.points[curve.points.length - 1]?.layoverMinutes ?? 0} minutes; this layover is ${curve.layoverMinutes} minutes${curve.minLayoverMinutes !== null ? `, the target needs ${curve.minLayoverMinutes}` : ''}.`}
        />
      </figure>
      <WhatIf key={`${curve.tripId}/${curve.connectionIndex}/${curve.layoverMinutes}`} curve={curve} intervalPercent={intervalPercent} />
      <figure>
        <figcaption>How much time is left over at the gate (margin)</figcaption>
        <ChartCanvas config={marginChart} testId="margin-chart" description={`Distribution of the margin in ${curve.binMinutes}-minute bars; about ${percent(pMiss)} of it lies below zero (a missed connection).`} />
      </figure>
    </>
  );
}

function Section({ title, children }: { title: string; children: ComponentChildren }) {
  return (
    <section class="detail-section">
      <h4>{title}</h4>
      {children}
    </section>
  );
}

export function ConnectionDetail({ trip, connection: c, curve, curveError, colors, target, intervalLevel, onClose }: ConnectionDetailProps) {
  const inbound = trip.legs[c.inboundLeg];
  const outbound = trip.legs[c.inboundLeg + 1];
  const intervalPercent = Math.round(intervalLevel * 100);
  return (
    <aside class="detail" aria-labelledby="detail-title" data-testid="connection-detail">
      <header class="detail-head">
        <h3 id="detail-title">
          {trip.traveler}: connection at {c.airport}
        </h3>
        <button type="button" onClick={onClose} aria-label="Close the connection detail">
          Close
        </button>
      </header>
      <ol class="detail-legs">
        {inbound && <li>In: {legSummary(inbound)}</li>}
        {outbound && <li>Out: {legSummary(outbound)}</li>}
      </ol>
      {c.pMake !== null ? (
        <p class="sentence" data-testid="miss-sentence">
          {missSentence(c.pMake)}
        </p>
      ) : (
        <p class="sentence">{c.unscoredReason}</p>
      )}
      <dl class="facts">
        <dt>Layover</dt>
        <dd>{duration(c.layoverMinutes)}</dd>
        <dt>MCT</dt>
        <dd>
          {c.mctMinutes === null ? '—' : duration(c.mctMinutes)}
          {c.mctSource && <span class="muted"> ({c.mctSource === 'override' ? 'your override' : `default for a ${c.connectionType ?? ''} connection`})</span>}
        </dd>
        <dt>P(make)</dt>
        <dd>
          {percent(c.pMake)} <span class="muted">{c.pMakeLo !== null ? `(${intervalPercent}% credible interval ${percentRange(c.pMakeLo, c.pMakeHi)})` : ''}</span>
        </dd>
        <dt>For the {Math.round(target * 100)}% target</dt>
        <dd>{targetSentence(c, target)}</dd>
      </dl>
      {(c.flags.length > 0 || c.warnings.length > 0) && (
        <Section title="Watch out">
          <ul class="warnings">
            {c.warnings.map((w) => (
              <li key={w.code}>{w.message}</li>
            ))}
            {c.flags
              .filter((f) => !c.warnings.some((w) => w.code === f))
              .map((f) => (
                <li key={f}>{flagWords(f)}</li>
              ))}
          </ul>
        </Section>
      )}
      <Section title="The data behind it">
        <ul class="data-notes">
          {c.data.length ? c.data.map((d) => <li key={`${d.kind}${d.origin}${d.destination}`}>{routeDataSentence(d)}</li>) : <li>No posterior data was used.</li>}
        </ul>
      </Section>
      {c.pMake !== null && (curve ? <Charts curve={curve} colors={colors} intervalPercent={intervalPercent} /> : <p aria-busy={curveError ? 'false' : 'true'}>{curveError ?? 'Drawing the charts…'}</p>)}
      <p class="caution">Estimates from historical delay data, not guarantees. Airline rules, minimum connecting times and local regulations decide what is protected.</p>
    </aside>
  );
}
