// The content of Layline's two reports, before any layout: the manager report and the
// per-traveler briefings. Built by manager-report.ts and briefings.ts, rendered to HTML by
// render-html.ts; the app may render the same model in its own components.
//
// Every field a reader sees is already a finished string, so the HTML, the page and any
// future format say exactly the same thing; the raw numbers sit beside them for charts and tests.
import type { Problem } from '../itinerary/types';
import type { ProbabilityRow, OptionBar } from './svg-charts';
import type { LocalTimeParts } from './format';

/** What the caller knows beyond the scores: who the report is for and when it was made. */
export interface ReportOptions {
  /** Shown as the report's title; default "Connection risk report" / "Travel briefings". */
  readonly title?: string;
  /** The organisation or workspace, shown under the title (e.g. "Harbourview Analytics offsite"). */
  readonly organisation?: string;
  /** When the report was made, ISO 8601; passed in so the same input gives the same report. */
  readonly generatedAt: string;
  /** Extra facts about the posterior bundle that the scores do not carry. */
  readonly bundleDetails?: BundleDetails;
}

export interface BundleDetails {
  /** First and last flight dates in the fit data, ISO dates. */
  readonly dateRange?: { readonly first: string; readonly last: string };
  /** Total flights in the fit data. */
  readonly flights?: number;
  /** Anything else worth a reader's attention, in one sentence. */
  readonly note?: string;
}

export interface LabelledValue {
  readonly label: string;
  readonly value: string;
}

export interface ReportSummary {
  readonly travelers: number;
  /** Distinct trips (a trip with several options counts once). */
  readonly trips: number;
  /** Trips that have more than one option. */
  readonly tripsWithOptions: number;
  /** Scored connections on the options the group counts (the best-ranked option of each trip). */
  readonly connections: number;
  readonly belowTarget: number;
  readonly belowMct: number;
  readonly separateTickets: number;
  readonly expectedMisconnecting: number;
  readonly pAtLeastOneMisconnects: number;
  readonly target: number;
  /** The summary paragraph. */
  readonly text: string;
}

export interface Recommendation {
  /** 'connection': below the target; 'deadline': a late arrival risk; 'separate-tickets': an unprotected connection. */
  readonly kind: 'connection' | 'deadline' | 'separate-tickets';
  /** Who and where, e.g. "Mara Lindqvist · Lisbon workshop · option A · ORD". */
  readonly subject: string;
  /** What the numbers say, in a sentence. */
  readonly finding: string;
  /** What would reach the target, in a sentence. */
  readonly action: string;
}

export interface ConnectionRow {
  readonly airport: string;
  readonly flights: string;
  readonly layover: string;
  readonly mct: string;
  readonly minLayover: string;
  readonly margin: string;
  readonly pMake: string;
  readonly interval: string;
  readonly missFrequency: string;
  readonly flags: string;
  /** True when P(make) is below the target, so the layout can mark the row in text and style. */
  readonly belowTarget: boolean;
}

export interface TripRow {
  readonly traveler: string;
  readonly trip: string;
  /** '' for a trip without options; else "A (ranked 1 of 2, not beaten)". */
  readonly option: string;
  /** "LHR → ORD → DEN" */
  readonly route: string;
  readonly departs: string;
  readonly pAllConnections: string;
  readonly pAllInterval: string;
  readonly onTime: string;
  readonly expectedDelay: string;
  readonly deadline: string;
  /** True for the option the group summary counts. */
  readonly counted: boolean;
  readonly connections: readonly ConnectionRow[];
}

export interface OptionComparison {
  readonly title: string;
  readonly sentence: string;
  readonly bars: readonly OptionBar[];
}

export interface ManagerReport {
  readonly kind: 'manager';
  readonly title: string;
  readonly subtitle: string;
  readonly generatedAt: string;
  readonly summary: ReportSummary;
  /** Plain sentences with natural frequencies, most important first. */
  readonly keyPoints: readonly string[];
  readonly recommendations: readonly Recommendation[];
  readonly trips: readonly TripRow[];
  /** P(make) per distinct connection, lowest first, in chunks that fit on a page. */
  readonly connectionChart: { readonly title: string; readonly chunks: readonly (readonly ProbabilityRow[])[] };
  readonly optionComparisons: readonly OptionComparison[];
  readonly group: {
    readonly text: string;
    readonly atLeast: readonly LabelledValue[];
    readonly topConnections: readonly string[];
  };
  readonly assumptions: readonly LabelledValue[];
  readonly provenance: { readonly bundle: readonly LabelledValue[]; readonly routes: readonly LabelledValue[] };
  readonly cautions: readonly string[];
  readonly problems: readonly Problem[];
  readonly target: number;
}

export interface BriefingLeg {
  readonly flight: string;
  readonly from: string;
  readonly to: string;
  readonly depart: LocalTimeParts;
  readonly arrive: LocalTimeParts;
  /** "+1" when the flight lands on a later local day than it left; '' otherwise. */
  readonly dayChange: string;
  readonly booking: string;
}

export interface BriefingConnection {
  /** "Chicago (ORD)" */
  readonly place: string;
  readonly flights: string;
  readonly layover: string;
  /** "Most days this works: about 1 in 14 travelers on this connection miss it." */
  readonly chance: string;
  /** Extra facts a traveler needs: separate tickets, change of airport, overnight. */
  readonly notes: readonly string[];
  /** 'watch' for the tightest connection when it is below the target, 'tightest' when it is not, else ''. */
  readonly mark: 'watch' | 'tightest' | '';
}

export interface Briefing {
  readonly traveler: string;
  readonly trip: string;
  /** Which option this briefing covers, when the trip has several; '' otherwise. */
  readonly optionNote: string;
  /** One sentence: where the trip goes and when. */
  readonly overview: string;
  readonly legs: readonly BriefingLeg[];
  readonly connections: readonly BriefingConnection[];
  /** The connection to watch and why, or a sentence saying the trip has no connection. */
  readonly watch: { readonly heading: string; readonly why: readonly string[] };
  /** What to do if a connection is missed. */
  readonly ifMissed: readonly string[];
  /** The deadline and the chance of meeting it, or null when the trip has none. */
  readonly deadline: string | null;
}

export interface BriefingsReport {
  readonly kind: 'briefings';
  readonly title: string;
  readonly subtitle: string;
  readonly generatedAt: string;
  readonly briefings: readonly Briefing[];
  /** Printed at the foot of every briefing. */
  readonly caution: string;
}

export type Report = ManagerReport | BriefingsReport;
