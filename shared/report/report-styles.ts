// The inline style sheet of a standalone report, for screen and for print.
//
// Print rules: a table row is never split across pages (break-inside: avoid on rows, and on a
// trip's group of rows while it fits), table headers repeat on each page, every briefing starts
// on a new page, and a chart is never cut. Paper size and margins come from the printer
// (shared/report/print-layout.ts), so one HTML prints on A4 and US Letter alike.

export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { margin: 0 auto; max-width: 200mm; padding: 10mm 8mm; font: 10pt/1.42 Helvetica, Arial, "Liberation Sans", sans-serif; color: #1b1f24; background: #fff; }
@media print { body { max-width: none; padding: 0; } }
header.report-head { border-bottom: 2px solid #1b1f24; margin-bottom: 5mm; padding-bottom: 2mm; }
h1 { font-size: 19pt; margin: 0 0 1mm; letter-spacing: -0.01em; }
.subtitle { color: #4a525c; margin: 0; }
h2 { font-size: 13pt; margin: 6mm 0 2mm; break-after: avoid; page-break-after: avoid; }
h3 { font-size: 11pt; margin: 4mm 0 1.5mm; break-after: avoid; page-break-after: avoid; }
p { margin: 0 0 2mm; }
.summary { font-size: 11pt; background: #f1f4f7; border-left: 4px solid #2f6b8f; padding: 3mm 4mm; break-inside: avoid; }
.figures { display: flex; flex-wrap: wrap; gap: 3mm; margin: 3mm 0; padding: 0; list-style: none; break-inside: avoid; }
.figures li { border: 1px solid #c9d0d8; border-radius: 2mm; padding: 2mm 3mm; min-width: 30mm; }
.figures .n { display: block; font-size: 16pt; font-weight: 700; }
.figures .what { font-size: 8.5pt; color: #4a525c; }
ul.points, ol.recs { padding-left: 5mm; margin: 0 0 2mm; }
ul.points li, ol.recs li { margin-bottom: 1.5mm; break-inside: avoid; page-break-inside: avoid; }
.recs .subject { font-weight: 700; }
.recs .kind { font-size: 8pt; text-transform: uppercase; letter-spacing: 0.04em; color: #4a525c; margin-right: 1.5mm; }
table { border-collapse: collapse; width: 100%; margin: 1mm 0 3mm; font-size: 8.5pt; }
thead { display: table-header-group; }
tfoot { display: table-footer-group; }
tr { break-inside: avoid; page-break-inside: avoid; }
tbody.trip { break-inside: avoid; page-break-inside: avoid; }
th, td { text-align: left; vertical-align: top; padding: 1.1mm 1.4mm; border-bottom: 1px solid #d9dde3; }
th { background: #e6ebf0; font-weight: 700; }
td.num, th.num { text-align: right; white-space: nowrap; }
td.freq { white-space: nowrap; }
tr.trip-head td { background: #f4f6f8; border-top: 1.5px solid #8a949f; }
tr.trip-head .who { font-weight: 700; }
tr.trip-head .not-counted { color: #4a525c; font-style: italic; }
tr.below td { background: #fbeeea; }
tr.below td.p { color: #8f2a16; font-weight: 700; }
.marker { font-weight: 700; color: #8f2a16; white-space: nowrap; }
.chart-block { break-inside: avoid; page-break-inside: avoid; margin: 2mm 0 4mm; }
svg.chart { max-width: 100%; height: auto; display: block; }
dl.facts { display: grid; grid-template-columns: 50mm 1fr; gap: 1mm 4mm; margin: 0 0 3mm; }
dl.facts dt { font-weight: 700; }
dl.facts dd { margin: 0; }
dl.facts dt, dl.facts dd { break-inside: avoid; }
.cautions { border: 1.5px solid #8a949f; padding: 3mm 4mm; break-inside: avoid; page-break-inside: avoid; }
.cautions ul { margin: 0; padding-left: 5mm; }
.problems li { font-size: 9pt; }
.page-break { break-before: page; page-break-before: always; }
.sr { position: absolute; width: 1px; height: 1px; overflow: hidden; clip-path: inset(50%); white-space: nowrap; }
section.briefing + section.briefing { break-before: page; page-break-before: always; }
section.briefing h2 { font-size: 16pt; margin-top: 0; }
.briefing .overview { font-size: 11pt; }
.briefing .option-note { font-style: italic; color: #4a525c; }
.briefing td .zone { color: #4a525c; font-size: 8pt; display: block; }
.briefing .day-change { font-weight: 700; margin-left: 1mm; }
.watch { border-left: 4px solid #b3361d; background: #fbeeea; padding: 2.5mm 4mm; margin: 2mm 0 3mm; break-inside: avoid; }
.watch.calm { border-left-color: #2f6b8f; background: #f1f4f7; }
.watch h3 { margin-top: 0; }
.conn { margin: 0 0 2mm; break-inside: avoid; }
.conn .head { font-weight: 700; }
.conn .tag { font-size: 8pt; font-weight: 700; border: 1px solid #b3361d; color: #8f2a16; padding: 0 1mm; margin-left: 1.5mm; }
.conn .tag.calm { border-color: #2f6b8f; color: #24536f; }
td .flights { display: block; white-space: nowrap; font-size: 8pt; color: #3a424b; }
.briefing .foot { font-size: 8.5pt; color: #4a525c; border-top: 1px solid #c9d0d8; padding-top: 2mm; margin-top: 4mm; }
`;
