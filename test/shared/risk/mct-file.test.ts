import { describe, expect, it } from 'vitest';
import { parseMctRules } from '../../../shared/risk/mct-file';

describe('parseMctRules', () => {
  it('reads CSV with a header in any order, aliases and comments', () => {
    const { rules, problems } = parseMctRules('# MCTs for the spring offsite\nType,Airport,MCT,departAirport\ndomestic,ord,50,\narriving-from-abroad,JFK,120\ntransfer,JFK,75,LGA\n');
    expect(problems).toEqual([]);
    expect(rules).toEqual([
      { airport: 'ORD', type: 'domestic', minutes: 50, line: 3 },
      { airport: 'JFK', type: 'international-arrival', minutes: 120, line: 4 },
      { airport: 'JFK', type: 'transfer', minutes: 75, departAirport: 'LGA', line: 5 },
    ]);
  });

  it('reads TSV pasted from a spreadsheet', () => {
    const { rules } = parseMctRules('airport\ttype\tminutes\r\n*\tinternational\t70\r\n');
    expect(rules).toEqual([{ airport: '*', type: 'international', minutes: 70, line: 2 }]);
  });

  it('reads JSON as an array or as { rules }', () => {
    const text = JSON.stringify([{ airport: 'LHR', type: 'international', minutes: 60 }, { airport: 'LHR', type: 'transfer', minutes: 150, departAirport: 'LGW' }]);
    expect(parseMctRules(text).rules).toHaveLength(2);
    expect(parseMctRules(JSON.stringify({ rules: [{ airport: 'CDG', type: 'domestic', minutes: 40 }] })).rules[0]).toEqual({ airport: 'CDG', type: 'domestic', minutes: 40, line: 1 });
  });

  it('reports every bad row with its line and keeps the good ones', () => {
    const { rules, problems } = parseMctRules('airport,type,minutes\nORD,domestic,45\nXX,domestic,45\nORD,sideways,45\nORD,domestic,-5\nORD,domestic,4.5\nORD,domestic,50,LGA\n');
    // The row with an extra cell is kept, with a warning.
    expect(rules.map((r) => r.line)).toEqual([2, 7]);
    expect(problems.map((p) => [p.line, p.code])).toEqual([
      [3, 'mct-bad-airport'],
      [4, 'mct-bad-type'],
      [5, 'mct-bad-minutes'],
      [6, 'mct-bad-minutes'],
      [7, 'mct-extra-cells'],
    ]);
  });

  it('rejects departAirport on a rule that is not a transfer', () => {
    const { problems } = parseMctRules('airport,type,minutes,departAirport\nORD,domestic,45,MDW\n');
    expect(problems[0]!.code).toBe('mct-bad-rule');
  });

  it('explains a missing header column, bad JSON and an empty file', () => {
    expect(parseMctRules('airport,minutes\nORD,45').problems[0]).toMatchObject({ code: 'mct-bad-header', message: expect.stringContaining('type') });
    expect(parseMctRules('{ nope').problems[0]!.code).toBe('mct-bad-json');
    expect(parseMctRules('{"rules": 3}').problems[0]!.code).toBe('mct-bad-json');
    expect(parseMctRules('  \n').problems[0]!.code).toBe('mct-empty');
  });

  it('never throws on hostile input', () => {
    for (const text of ['"', ',,,,', '\u0000\u0001', '[1,2,3]', '{"rules":[null,{}]}', 'a'.repeat(10000)]) {
      expect(() => parseMctRules(text)).not.toThrow();
    }
  });
});
