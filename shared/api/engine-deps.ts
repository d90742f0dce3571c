// Wires the engine handlers to the real engines: the intake parser, the risk engine's
// scorer and curves, the airport table and the bundled posteriors.
import type { PosteriorSource } from '../delay/predictive';
import { parseTrips } from '../itinerary/parse-trips';
import { connectionPairFor, makeCurve, marginDistribution } from '../risk/connection-curves';
import { scoreTrips } from '../risk/score-trips';
import { findAirport } from '../time/airports';
import { loadBundledPosteriors } from './bundled-posteriors';
import type { EngineDeps } from './engine-handlers';

export function realEngineDeps(nowMs: () => number, loadPosteriorSource: () => Promise<PosteriorSource> = loadBundledPosteriors, score: EngineDeps['scoreTrips'] = scoreTrips): EngineDeps {
  return {
    parseTrips: (text) => parseTrips(text),
    loadPosteriorSource,
    scoreTrips: score,
    connectionCurves: (scored, tripId, connectionIndex, source) => {
      const trip = scored.trips.find((t) => t.id === tripId);
      const c = trip?.connections[connectionIndex];
      const inbound = c && trip?.legs[c.inboundLeg];
      const outbound = c && trip?.legs[c.inboundLeg + 1];
      if (!trip || !c || !inbound || !outbound) throw new Error(`trip ${tripId} has no connection ${connectionIndex}`);
      if (!c.scored || c.pMake === null) throw new Error(`the connection at ${c.airport} is not scored`);
      const pair = connectionPairFor(source, { inbound: { from: inbound.from, to: inbound.to }, outbound: { from: outbound.from, to: outbound.to } });
      return {
        curve: makeCurve(pair, { mctMinutes: c.mctMinutes, target: scored.target, intervalLevel: scored.intervalLevel }),
        margin: marginDistribution(pair, { layoverMinutes: c.layoverMinutes, mctMinutes: c.mctMinutes, intervalLevel: scored.intervalLevel }),
      };
    },
    countryOf: (iata) => findAirport(iata)?.country,
    nowMs,
  };
}
