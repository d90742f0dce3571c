// The group as a whole: how many travelers are expected to misconnect, the distribution of
// that count, the connections that drive it and the travelers most at risk.
import { useMemo } from 'preact/hooks';
import type { GroupView as Group } from '../../shared/api/analysis-schema';
import { groupCountConfig, type ChartColors } from '../charts/chart-configs';
import { ChartCanvas } from '../charts/chart-canvas';
import { percent } from '../app/format';

export function GroupView({ group, colors, onShowTraveler }: { group: Group; colors: ChartColors; onShowTraveler: (traveler: string) => void }) {
  const config = useMemo(() => groupCountConfig(group, colors), [group, colors]);
  const atLeastOne = group.pAtLeast.find((r) => r.k === 1)?.p ?? 0;
  return (
    <section class="group" aria-labelledby="group-title">
      <h2 id="group-title">The group</h2>
      <div class="headline-figures">
        <p>
          <span class="figure" data-testid="group-travelers">
            {group.travelers}
          </span>{' '}
          travelers
        </p>
        <p>
          <span class="figure" data-testid="group-expected">
            {group.expectedMisconnecting.toFixed(1)}
          </span>{' '}
          expected to miss a connection <span class="muted">(± {group.expectedMisconnectingStdError.toFixed(2)} simulation error)</span>
        </p>
        <p>
          <span class="figure">{percent(atLeastOne)}</span> chance that at least one misses
        </p>
      </div>
      <p class="muted">Travelers on the same flight share its delay, so misses come in clusters; each traveler counts once, on the best-ranked option of each trip. {group.simulations.toLocaleString('en-US')} simulations.</p>
      <figure>
        <figcaption>How many travelers miss a connection</figcaption>
        <ChartCanvas config={config} testId="group-chart" height={240} description={`Bar chart of the number of travelers who miss a connection; ${percent(group.countDistribution[0] ?? 0)} chance nobody does.`} />
      </figure>
      <table class="plain">
        <caption>Chance that at least this many travelers miss a connection</caption>
        <thead>
          <tr>
            {group.pAtLeast.map((r) => (
              <th key={r.k} scope="col">
                ≥ {r.k}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr>
            {group.pAtLeast.map((r) => (
              <td key={r.k}>{percent(r.p)}</td>
            ))}
          </tr>
        </tbody>
      </table>
      <div class="two-col">
        <table class="plain">
          <caption>Connections that drive it</caption>
          <thead>
            <tr>
              <th scope="col">Where</th>
              <th scope="col">Flights</th>
              <th scope="col">Travelers</th>
              <th scope="col">P(miss)</th>
              <th scope="col">Expected misses</th>
            </tr>
          </thead>
          <tbody>
            {group.topConnections.map((c) => (
              <tr key={`${c.airport}${c.inboundFlight}${c.outboundFlight}${c.inboundDate}`}>
                <td>{c.airport}</td>
                <td>
                  {c.inboundFlight} → {c.outboundFlight} <span class="muted">{c.inboundDate}</span>
                </td>
                <td class="num">{c.travelers}</td>
                <td class="num">{percent(c.pMiss)}</td>
                <td class="num">{c.expectedMisses.toFixed(2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <table class="plain">
          <caption>Travelers at risk (chance of a missed connection above 1 − target)</caption>
          <thead>
            <tr>
              <th scope="col">Traveler</th>
              <th scope="col">P(misses a connection)</th>
            </tr>
          </thead>
          <tbody>
            {group.atRisk.length === 0 ? (
              <tr>
                <td colSpan={2}>Nobody is above the limit.</td>
              </tr>
            ) : (
              group.atRisk.map((r) => (
                <tr key={r.tripId}>
                  <td>
                    <button type="button" class="link" onClick={() => onShowTraveler(r.traveler)}>
                      {r.traveler}
                    </button>
                  </td>
                  <td class="num">{percent(r.pMiss)}</td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
    </section>
  );
}
