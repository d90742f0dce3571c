// Renders a report model to one self-contained HTML document: inline CSS, inline SVG
// charts, no script and no external resource, so it opens, mails and prints anywhere.
//
// A Content-Security-Policy meta tag forbids every fetch, so a saved report never reaches
// the network even when opened in a browser.
import { escapeHtml as e } from './html';
import { formatPercent } from './format';
import type { Briefing, BriefingsReport, LabelledValue, ManagerReport, Report, TripRow } from './report-model';
import { REPORT_CSS } from './report-styles';
import { optionChartSvg, probabilityChartSvg } from './svg-charts';

const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:";

function htmlDocument(title: string, body: string): string {
  return (
    '<!doctype html>\n<html lang="en">\n<head>\n<meta charset="utf-8">\n' +
    `<meta http-equiv="Content-Security-Policy" content="${CSP}">\n` +
    '<meta name="viewport" content="width=device-width, initial-scale=1">\n' +
    `<meta name="generator" content="Layline">\n<title>${e(title)}</title>\n<style>${REPORT_CSS}</style>\n</head>\n<body>\n${body}\n</body>\n</html>\n`
  );
}

function head(title: string, subtitle: string): string {
  return `<header class="report-head"><h1>${e(title)}</h1><p class="subtitle">${e(subtitle)}</p></header>`;
}

function facts(items: readonly LabelledValue[]): string {
  return `<dl class="facts">${items.map((i) => `<dt>${e(i.label)}</dt><dd>${e(i.value)}</dd>`).join('')}</dl>`;
}

function list(items: readonly string[], cls = 'points'): string {
  return `<ul class="${cls}">${items.map((i) => `<li>${e(i)}</li>`).join('')}</ul>`;
}

const TRIP_COLUMNS = ['Connection', 'Layover', 'MCT', 'Min. layover', 'Margin', 'P(make)', '90% interval', 'Missed', 'Notes'] as const;

function tripBody(t: TripRow): string {
  const who = [t.traveler, t.trip].filter(Boolean).join(' · ');
  const option = t.option ? ` · option ${t.option}` : '';
  const counted = t.counted ? '' : ' <span class="not-counted">(alternative, not counted in the group)</span>';
  const headline =
    `<span class="who">${e(who)}${e(option)}</span>${counted}<br>${e(t.route)} · departs ${e(t.departs)}<br>` +
    `All connections: ${e(t.pAllConnections)}${t.pAllInterval !== '—' ? ` (${e(t.pAllInterval)})` : ''} · on time: ${e(t.onTime)} · ` +
    `expected delay ${e(t.expectedDelay)}${t.deadline !== '—' ? ` · deadline ${e(t.deadline)}` : ''}`;
  const rows = t.connections.map(
    (c) =>
      `<tr class="conn${c.belowTarget ? ' below' : ''}"><td>${e(c.airport)}<span class="flights">${e(c.flights)}</span></td><td class="num">${e(c.layover)}</td><td class="num">${e(c.mct)}</td>` +
      `<td class="num">${e(c.minLayover)}</td><td class="num">${e(c.margin)}</td><td class="num p">${e(c.pMake)}${c.belowTarget ? '<br><span class="marker">▲ below</span>' : ''}</td>` +
      `<td class="num">${e(c.interval)}</td><td class="freq">${e(c.missFrequency)}</td><td>${e(c.flags)}</td></tr>`,
  );
  if (rows.length === 0) rows.push(`<tr class="conn"><td colspan="${TRIP_COLUMNS.length}">Nonstop: no connection.</td></tr>`);
  return `<tbody class="trip"><tr class="trip-head"><td colspan="${TRIP_COLUMNS.length}">${headline}</td></tr>${rows.join('')}</tbody>`;
}

function tripTable(trips: readonly TripRow[]): string {
  const headCells = TRIP_COLUMNS.map((c, i) => `<th${i > 0 && i < 7 ? ' class="num"' : ''} scope="col">${e(c)}</th>`).join('');
  return `<table class="trips"><caption class="sr">Trips and connections</caption><thead><tr>${headCells}</tr></thead>${trips.map(tripBody).join('')}</table>`;
}

function managerBody(r: ManagerReport): string {
  const s = r.summary;
  const figures = [
    [String(s.travelers), 'travelers'],
    [String(s.connections), 'connections'],
    [String(s.belowTarget), `below the ${formatPercent(s.target)} target`],
    [s.expectedMisconnecting.toFixed(1), 'expected to miss a connection'],
  ]
    .map(([n, what]) => `<li><span class="n">${e(n ?? '')}</span><span class="what">${e(what ?? '')}</span></li>`)
    .join('');
  const parts: string[] = [head(r.title, r.subtitle)];
  parts.push(`<section aria-label="Summary"><p class="summary">${e(s.text)}</p><ul class="figures">${figures}</ul>${list(r.keyPoints)}</section>`);

  parts.push('<section aria-label="Recommended changes"><h2>Recommended changes</h2>');
  if (r.recommendations.length === 0) {
    parts.push(`<p>None: every connection reaches the ${e(formatPercent(r.target))} target and no trip relies on separate tickets.</p>`);
  } else {
    const kindWords = { connection: 'below target', deadline: 'deadline', 'separate-tickets': 'separate tickets' } as const;
    parts.push(
      `<ol class="recs">${r.recommendations
        .map((x) => `<li><span class="kind">${e(kindWords[x.kind])}</span><span class="subject">${e(x.subject)}</span><br>${e(x.finding)} ${e(x.action)}</li>`)
        .join('')}</ol>`,
    );
  }
  parts.push('</section>');

  parts.push('<section aria-label="Connections chart"><h2>Every connection against the target</h2>');
  if (r.connectionChart.chunks.length === 0) parts.push('<p>No scored connection.</p>');
  r.connectionChart.chunks.forEach((rows, i) => {
    const title = r.connectionChart.chunks.length > 1 ? `${r.connectionChart.title} (part ${i + 1} of ${r.connectionChart.chunks.length})` : r.connectionChart.title;
    parts.push(`<div class="chart-block">${probabilityChartSvg(rows, r.target, title)}</div>`);
  });
  parts.push('</section>');

  if (r.optionComparisons.length > 0) {
    parts.push('<section aria-label="Options compared"><h2>Options compared</h2>');
    for (const o of r.optionComparisons) {
      parts.push(`<div class="chart-block"><h3>${e(o.title)}</h3><p>${e(o.sentence)}</p>${optionChartSvg(o.bars, `Options for ${o.title}`)}</div>`);
    }
    parts.push('<p>"Not beaten": no other option is at least as good on the chance of arriving on time, the expected delay and the travel time, and better on one.</p></section>');
  }

  parts.push(`<section aria-label="Group outlook"><h2>The group</h2><p>${e(r.group.text)}</p>${facts(r.group.atLeast)}`);
  if (r.group.topConnections.length > 0) parts.push(`<h3>Connections that drive the misses</h3>${list(r.group.topConnections)}`);
  parts.push('</section>');

  parts.push(`<section aria-label="Trips and connections"><h2>Trips and connections</h2>`);
  parts.push(
    '<p>P(make): the chance of making the connection. Min. layover: the shortest layover that reaches the target; margin: the layover minus that minimum. ' +
      'Rows marked ▲ are below the target.</p>',
  );
  parts.push(tripTable(r.trips), '</section>');

  parts.push(`<section aria-label="Assumptions"><h2>Assumptions</h2>${facts(r.assumptions)}</section>`);
  parts.push(`<section aria-label="Data provenance"><h2>Data provenance</h2>${facts(r.provenance.bundle)}`);
  if (r.provenance.routes.length > 0) parts.push(`<h3>Flights behind each route</h3>${facts(r.provenance.routes)}`);
  parts.push('</section>');
  if (r.problems.length > 0) {
    parts.push(
      `<section aria-label="Input problems"><h2>Input problems</h2><p>What reading the trips file noticed, by line. Lines with an error were not scored; warnings are worth a look.</p>` +
        `<ul class="problems">${r.problems.map((p) => `<li>${p.line > 0 ? `line ${p.line}` : 'input'}, ${e(p.severity)}: ${e(p.message)}</li>`).join('')}</ul></section>`,
    );
  }
  parts.push(`<section class="cautions" aria-label="Cautions"><h2>Cautions</h2>${list(r.cautions, 'caution-list')}</section>`);
  return parts.join('\n');
}

function briefingSection(b: Briefing, caution: string): string {
  const title = [b.traveler, b.trip].filter(Boolean).join(' · ');
  const legRows = b.legs
    .map(
      (l) =>
        `<tr><td>${e(l.flight)}</td><td>${e(l.from)}<span class="zone">${e(l.depart.day)}</span></td><td class="num">${e(l.depart.time)}<span class="zone">${e(l.depart.zone)}</span></td>` +
        `<td>${e(l.to)}<span class="zone">${e(l.arrive.day)}</span></td><td class="num">${e(l.arrive.time)}${l.dayChange ? `<span class="day-change">${e(l.dayChange)}</span>` : ''}<span class="zone">${e(l.arrive.zone)}</span></td>` +
        `<td>${e(l.booking)}</td></tr>`,
    )
    .join('');
  const conns = b.connections
    .map(
      (c) =>
        `<div class="conn"><span class="head">${e(c.place)}: ${e(c.layover)} to change planes (${e(c.flights)})</span>${c.mark === 'watch' ? '<span class="tag">WATCH</span>' : c.mark === 'tightest' ? '<span class="tag calm">TIGHTEST</span>' : ''}<br>` +
        `${e(c.chance)}${c.notes.length > 0 ? ' ' + c.notes.map(e).join(' ') : ''}</div>`,
    )
    .join('');
  const calm = b.watch.heading.startsWith('Watch') ? '' : ' calm';
  return (
    `<section class="briefing" aria-label="Briefing for ${e(title)}"><h2>${e(title)}</h2>` +
    `<p class="overview">${e(b.overview)}</p>${b.optionNote ? `<p class="option-note">${e(b.optionNote)}</p>` : ''}` +
    `<h3>Your flights</h3><table class="legs"><thead><tr><th scope="col">Flight</th><th scope="col">From</th><th class="num" scope="col">Departs</th><th scope="col">To</th><th class="num" scope="col">Arrives</th><th scope="col">Booking</th></tr></thead><tbody>${legRows}</tbody></table>` +
    (conns ? `<h3>Your connections</h3>${conns}` : '') +
    `<div class="watch${calm}"><h3>${e(b.watch.heading)}</h3>${b.watch.why.map((w) => `<p>${e(w)}</p>`).join('')}</div>` +
    (b.deadline ? `<h3>Your deadline</h3><p>${e(b.deadline)}</p>` : '') +
    (b.ifMissed.length > 0 ? `<h3>If you miss a connection</h3>${list(b.ifMissed)}` : '') +
    `<p class="foot">${e(caution)}</p></section>`
  );
}

function briefingsBody(r: BriefingsReport): string {
  if (r.briefings.length === 0) return `${head(r.title, r.subtitle)}<p>No trips to brief.</p>`;
  // The report head sits inside the first briefing's page, so each traveler still gets one page.
  return `${head(r.title, r.subtitle)}\n${r.briefings.map((b) => briefingSection(b, r.caution)).join('\n')}`;
}

/** The report as one standalone HTML document. */
export function renderReportHtml(report: Report): string {
  return htmlDocument(report.title, report.kind === 'manager' ? managerBody(report) : briefingsBody(report));
}
