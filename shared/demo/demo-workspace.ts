// The demo workspace: an invented organisation sending 30 invented people to an invented
// meeting, on real US airports and hubs that the bundled 2001 domestic posteriors cover.
//
// Tidewater Survey Instruments holds its "Harbor Week" in Boston from Monday 9 March 2026;
// most staff fly on Sunday 8 March, the day US clocks go forward (second Sunday of March,
// Energy Policy Act of 2005). Flight numbers and booking references are made up.
// What it shows: a tight evening connection at ORD shared by ten travelers, two travelers
// with two routing options each, a red-eye across the DST change, a separate-tickets
// self-transfer at LAS, and groups booked on the same flights.
import { DEFAULT_ANALYSIS_SETTINGS } from '../workspace/settings';
import type { WorkspaceContent } from '../workspace/format';

export const DEMO_ORGANISATION = 'Tidewater Survey Instruments';
export const DEMO_SCENARIO = 'Harbor Week in Boston, 9–11 March 2026';
export const DEMO_TRAVELER_COUNT = 30;

export const DEMO_TRIPS_TEXT = `traveler,trip,option,flight,from,depart,to,arrive,booking,deadline
Ines Calloway,Harbor Week,,UA 1184,DFW,2026-03-08 15:10,ORD,17:35,QX7D21,2026-03-08 23:30
Ines Calloway,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX7D21,2026-03-08 23:30
Tobias Wren,Harbor Week,,UA 1184,DFW,2026-03-08 15:10,ORD,17:35,QX7D22,2026-03-08 23:30
Tobias Wren,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX7D22,2026-03-08 23:30
Halima Osei,Harbor Week,,UA 1184,DFW,2026-03-08 15:10,ORD,17:35,QX7D23,2026-03-08 23:30
Halima Osei,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX7D23,2026-03-08 23:30
Rafael Duarte,Harbor Week,,UA 1184,DFW,2026-03-08 15:10,ORD,17:35,QX7D24,2026-03-08 23:30
Rafael Duarte,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX7D24,2026-03-08 23:30
Greta Lindqvist,Harbor Week,,UA 1184,DFW,2026-03-08 15:10,ORD,17:35,QX7D25,2026-03-08 23:30
Greta Lindqvist,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX7D25,2026-03-08 23:30
Owen Marchetti,Harbor Week,,UA 962,STL,2026-03-08 16:05,ORD,17:20,QX8S01,
Owen Marchetti,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX8S01,
Yuki Tanabe,Harbor Week,,UA 962,STL,2026-03-08 16:05,ORD,17:20,QX8S02,
Yuki Tanabe,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX8S02,
Delphine Achebe,Harbor Week,,DL 1408,ATL,2026-03-08 12:40,DTW,14:40,QX3A11,
Delphine Achebe,Harbor Week,,DL 2216,DTW,2026-03-08 15:50,BOS,17:45,QX3A11,
Callum Reyes,Harbor Week,,DL 1408,ATL,2026-03-08 12:40,DTW,14:40,QX3A12,
Callum Reyes,Harbor Week,,DL 2216,DTW,2026-03-08 15:50,BOS,17:45,QX3A12,
Noor Haddad,Harbor Week,,DL 1408,ATL,2026-03-08 12:40,DTW,14:40,QX3A13,
Noor Haddad,Harbor Week,,DL 2216,DTW,2026-03-08 15:50,BOS,17:45,QX3A13,
Bram Kowalczyk,Harbor Week,,DL 1408,ATL,2026-03-08 12:40,DTW,14:40,QX3A14,
Bram Kowalczyk,Harbor Week,,DL 2216,DTW,2026-03-08 15:50,BOS,17:45,QX3A14,
Mateo Silvestri,Harbor Week,,UA 455,DEN,2026-03-08 09:05,ORD,12:30,QX4D31,
Mateo Silvestri,Harbor Week,,UA 722,ORD,2026-03-08 13:40,BOS,17:00,QX4D31,
Anouk Verhaegen,Harbor Week,,UA 455,DEN,2026-03-08 09:05,ORD,12:30,QX4D32,
Anouk Verhaegen,Harbor Week,,UA 722,ORD,2026-03-08 13:40,BOS,17:00,QX4D32,
Leon Achterberg,Harbor Week,,UA 455,DEN,2026-03-08 09:05,ORD,12:30,QX4D33,
Leon Achterberg,Harbor Week,,UA 722,ORD,2026-03-08 13:40,BOS,17:00,QX4D33,
Priya Raman,Harbor Week,A via DFW,AA 2402,LAX,2026-03-08 07:00,DFW,12:05,QX5L01,2026-03-08 19:30
Priya Raman,Harbor Week,A via DFW,AA 1567,DFW,2026-03-08 12:50,BOS,17:35,QX5L01,2026-03-08 19:30
Priya Raman,Harbor Week,B via ORD,UA 1502,LAX,2026-03-08 06:15,ORD,12:20,QX5L02,2026-03-08 19:30
Priya Raman,Harbor Week,B via ORD,UA 722,ORD,2026-03-08 13:40,BOS,17:00,QX5L02,2026-03-08 19:30
Marcus Oyelaran,Harbor Week,A via DTW,NW 1730,MSP,2026-03-08 11:15,DTW,14:05,QX6M01,
Marcus Oyelaran,Harbor Week,A via DTW,NW 382,DTW,2026-03-08 14:45,BOS,16:40,QX6M01,
Marcus Oyelaran,Harbor Week,B via ORD,UA 640,MSP,2026-03-08 10:30,ORD,11:55,QX6M02,
Marcus Oyelaran,Harbor Week,B via ORD,UA 722,ORD,2026-03-08 13:40,BOS,17:00,QX6M02,
Sunniva Aldana,Harbor Week,,WN 1021,PHX,2026-03-08 08:00,LAS,09:05,WN8QZ2,
Sunniva Aldana,Harbor Week,,B6 298,LAS,2026-03-08 10:15,BOS,18:40,B6K7TT,
Ezra Blackwood,Harbor Week,,UA 1866,SEA,2026-03-07 23:10,ORD,2026-03-08 06:05,QX9W01,
Ezra Blackwood,Harbor Week,,UA 510,ORD,2026-03-08 07:30,BOS,10:50,QX9W01,
Keiko Ferreira,Harbor Week,,UA 804,SFO,2026-03-08 09:20,ORD,15:30,QX2F01,
Keiko Ferreira,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX2F01,
Dmitri Halvorsen,Harbor Week,,UA 804,SFO,2026-03-08 09:20,ORD,15:30,QX2F02,
Dmitri Halvorsen,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX2F02,
Amara Nwosu,Harbor Week,,UA 804,SFO,2026-03-08 09:20,ORD,15:30,QX2F03,
Amara Nwosu,Harbor Week,,UA 1137,ORD,2026-03-08 18:20,BOS,21:40,QX2F03,
Lucia Montoya,Harbor Week,,US 1290,IAH,2026-03-08 11:30,CLT,14:55,QX1H01,
Lucia Montoya,Harbor Week,,US 1844,CLT,2026-03-08 15:45,BOS,17:50,QX1H01,
Felix Brandt,Harbor Week,,US 1290,IAH,2026-03-08 11:30,CLT,14:55,QX1H02,
Felix Brandt,Harbor Week,,US 1844,CLT,2026-03-08 15:45,BOS,17:50,QX1H02,
Rosalind Pike,Harbor Week,,NW 160,LAS,2026-03-08 07:45,MSP,13:00,QX7V01,
Rosalind Pike,Harbor Week,,NW 746,MSP,2026-03-08 14:05,BOS,17:35,QX7V01,
Hamza Qureshi,Harbor Week,,DL 1582,SLC,2026-03-08 07:10,ATL,12:50,QX3S01,
Hamza Qureshi,Harbor Week,,DL 1130,ATL,2026-03-08 14:25,BOS,16:55,QX3S01,
Beatrix Okonkwo,Harbor Week,,US 2118,DCA,2026-03-08 16:00,BOS,17:25,QX0D01,
Jonah Whitcombe,Harbor Week,,US 2118,DCA,2026-03-08 16:00,BOS,17:25,QX0D02,
Farah Lindgren,Harbor Week,,US 1522,PHL,2026-03-08 17:30,BOS,18:50,QX0P01,
Ilse Moreau,Harbor Week,,US 1740,PIT,2026-03-08 13:15,BOS,14:50,QX0T01,
Quentin Adeyemi,Harbor Week,,US 1030,CLT,2026-03-08 12:10,BOS,14:15,QX0C01,
`;

export const DEMO_WORKSPACE: WorkspaceContent = Object.freeze({
  tripsText: DEMO_TRIPS_TEXT,
  settings: DEFAULT_ANALYSIS_SETTINGS,
  bundleId: null,
  theme: 'system',
});
