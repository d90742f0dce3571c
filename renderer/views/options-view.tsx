// Alternatives: each traveler trip with several options, side by side, and a scatter of
// total travel time against P(on-time arrival) with the Pareto-optimal options marked.
import { useMemo } from 'preact/hooks';
import type { TripView } from '../../shared/api/analysis-schema';
import { optionsScatterConfig, type ChartColors } from '../charts/chart-configs';
import { ChartCanvas } from '../charts/chart-canvas';
import { duration, legSummary, percent, percentRange } from '../app/format';

export function optionGroups(trips: readonly TripView[]): TripView[][] {
  const groups = new Map<string, TripView[]>();
  for (const t of trips) if (t.optionCount > 1) groups.set(t.optionGroup, [...(groups.get(t.optionGroup) ?? []), t]);
  return [...groups.values()].map((g) => [...g].sort((a, b) => a.optionRank - b.optionRank || a.option.localeCompare(b.option)));
}

function OptionGroup({ options, colors }: { options: TripView[]; colors: ChartColors }) {
  const config = useMemo(() => optionsScatterConfig(options, colors), [options, colors]);
  const first = options[0];
  if (!first) return null;
  const basis = first.onTimeBasis === 'deadline' ? 'arriving by the deadline' : 'arriving within 15 minutes of schedule';
  return (
    <section class="option-group" aria-label={`Options for ${first.traveler}, ${first.trip}`}>
      <h3>
        {first.traveler} · {first.trip}
      </h3>
      <div class="option-cards">
        {options.map((t) => (
          <article key={t.id} class={`option-card${t.paretoOptimal ? ' pareto' : ''}`} aria-label={`Option ${t.option}`}>
            <h4>
              Option {t.option || '(unlabelled)'} <span class="rank">ranked {t.optionRank} of {t.optionCount}</span>
            </h4>
            {t.paretoOptimal ? <p class="badge">Pareto-optimal: no other option is better on every count</p> : <p class="muted">Another option is at least as good on every count</p>}
            <ol class="legs">
              {t.legs.map((l, i) => (
                <li key={i}>{legSummary(l)}</li>
              ))}
            </ol>
            <dl class="facts">
              <dt>On time ({basis})</dt>
              <dd>{percent(t.pOnTime)}</dd>
              <dt>All connections made</dt>
              <dd>
                {percent(t.pAllConnections)} <span class="muted">{percentRange(t.pAllLo, t.pAllHi)}</span>
              </dd>
              <dt>Expected arrival delay</dt>
              <dd>{duration(t.expectedArrivalDelayMinutes)}</dd>
              <dt>Total travel time</dt>
              <dd>{duration(t.totalTravelMinutes)}</dd>
            </dl>
          </article>
        ))}
      </div>
      <figure>
        <figcaption>Travel time against on-time chance</figcaption>
        <ChartCanvas config={config} testId="options-chart" height={240} description={`Scatter of ${options.length} options by total travel time and chance of arriving on time; Pareto-optimal options are drawn as diamonds.`} />
      </figure>
    </section>
  );
}

export function OptionsView({ trips, colors }: { trips: readonly TripView[]; colors: ChartColors }) {
  const groups = useMemo(() => optionGroups(trips), [trips]);
  return (
    <section class="options" aria-labelledby="options-title">
      <h2 id="options-title">Options compared</h2>
      {groups.length === 0 ? (
        <p>No trip has more than one option. Give rows of the same traveler and trip different values in the option column to compare routings.</p>
      ) : (
        groups.map((g) => <OptionGroup key={g[0]?.optionGroup} options={g} colors={colors} />)
      )}
    </section>
  );
}
