import { describe, expect, it } from 'vitest';
import { BRIEFING_CAUTION, buildBriefings } from '../../../shared/report/briefings';
import { renderReportHtml } from '../../../shared/report/render-html';
import { sampleScoredTrips } from '../../fixtures/report/scored-sample';

const OPTIONS = { generatedAt: '2026-04-01T09:30:00Z', organisation: 'Tidewater Instruments' };

function briefingFor(name: string) {
  const b = buildBriefings(sampleScoredTrips(), OPTIONS).briefings.find((x) => x.traveler === name);
  if (!b) throw new Error(`no briefing for ${name}`);
  return b;
}

describe('buildBriefings', () => {
  it("gives one briefing per traveler's trip, ordered by traveler", () => {
    const report = buildBriefings(sampleScoredTrips(), OPTIONS);
    expect(report.briefings.map((b) => b.traveler)).toEqual(['Ines Okafor', 'Olu Mensah', 'Priya Venkataraman', 'Tomas Brandt']);
    expect(report.caution).toBe(BRIEFING_CAUTION);
  });

  it('briefs the best-ranked option and says so', () => {
    const ines = briefingFor('Ines Okafor');
    expect(ines.legs[0]?.flight).toBe('UA 1190');
    expect(ines.optionNote).toBe('This briefing covers option B, the one Layline ranks first of 2. Your coordinator will confirm which option is booked.');
  });

  it('shows every leg in local time with its day and zone, and +1 for a next-day arrival (IANA tz: Europe/London is UTC+1 in April 2026)', () => {
    const leg = briefingFor('Tomas Brandt').legs[1];
    expect(leg).toMatchObject({
      flight: 'UA 958',
      from: 'Chicago (ORD)',
      to: 'London (LHR)',
      depart: { day: 'Tue 14 Apr 2026', time: '18:15', zone: 'America/Chicago, UTC−05:00' },
      arrive: { day: 'Wed 15 Apr 2026', time: '07:55', zone: 'Europe/London, UTC+01:00' },
      dayChange: '+1',
      booking: 'TWX9KD',
    });
  });

  it('names the connection to watch and why, in plain words', () => {
    const tomas = briefingFor('Tomas Brandt');
    expect(tomas.watch.heading).toBe('Watch your connection at Chicago (ORD)');
    expect(tomas.watch.why[0]).toBe(
      'You have 40 min between flights, less than the 1 h usually needed to change planes here. Ask your coordinator to confirm the airline accepts this connection.',
    );
    expect(tomas.connections.map((c) => c.mark)).toEqual(['watch', '']);
    expect(tomas.connections[0]?.chance).toBe('This one is tight: about 1 in 5 travelers on this connection miss it.');
  });

  it('says how late the first flight can be when the layover leaves time to spare', () => {
    const ines = briefingFor('Ines Okafor');
    expect(ines.watch.heading).toBe('All your connections have time to spare; the tightest is at London (LHR)');
    expect(ines.watch.why[0]).toContain('If your first flight (UA 958) lands more than about 1 h 15 min late, this connection is at risk.');
    expect(ines.connections.map((c) => c.mark)).toEqual(['', 'tightest']);
  });

  it('watches a connection on separate tickets even when it is likely to be made', () => {
    const priya = briefingFor('Priya Venkataraman');
    expect(priya.watch.heading).toBe('Watch your connection at London (LHR)');
    expect(priya.watch.why).toContain('Your two flights are on separate tickets, so the second airline will not wait for you or rebook you.');
    expect(priya.connections[0]?.mark).toBe('watch');
  });

  it('tells a traveler on one booking to use the transfer desk or the app', () => {
    const text = briefingFor('Tomas Brandt').ifMissed.join(' ');
    expect(text).toContain("the airline rebooks you: go to the airline's transfer desk at Chicago (ORD) or London (LHR), or use the airline's app");
    expect(text).toContain('about 3 h');
    expect(text).toContain('booking reference (TWX9KD)');
  });

  it('tells a traveler on separate tickets to re-check bags and have a fallback', () => {
    const priya = briefingFor('Priya Venkataraman');
    const text = priya.ifMissed.join(' ');
    expect(text).toContain('is on separate tickets. If you miss it, you are on your own');
    expect(text).toContain('collect your bags, check them in again');
    expect(text).toContain('Agree a fallback with your coordinator');
    expect(text).not.toContain('the airline rebooks you');
    expect(priya.connections[0]?.notes).toContain('Separate tickets: you must collect your bags and check in again.');
  });

  it('gives the deadline and the chance of meeting it (IANA tz: Europe/Lisbon is UTC+1 in April 2026)', () => {
    expect(briefingFor('Priya Venkataraman').deadline).toBe(
      'You need to be in Lisbon (LIS) by Wed 15 Apr 2026, 13:00 local time (Europe/Lisbon, UTC+01:00). On days like this, travelers arrive in time about 8 in 10 times. ' +
        'That is tight: talk to your coordinator about an earlier flight or arriving the day before.',
    );
    expect(briefingFor('Tomas Brandt').deadline).toBeNull();
  });

  it('handles a nonstop trip', () => {
    const olu = briefingFor('Olu Mensah');
    expect(olu.watch.heading).toBe('No connection on this trip');
    expect(olu.connections).toEqual([]);
    expect(olu.ifMissed).toEqual([]);
    expect(olu.overview).toContain('nonstop');
  });

  it('uses no statistics: no percentages, intervals or probability notation', () => {
    const html = renderReportHtml(buildBriefings(sampleScoredTrips(), OPTIONS));
    const text = html.replace(/<style>[\s\S]*?<\/style>/, '').replace(/<[^>]+>/g, ' ');
    expect(text).not.toMatch(/%|interval|probabilit|P\(|credible|posterior/i);
  });
});
