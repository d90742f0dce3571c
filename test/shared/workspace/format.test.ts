// The workspace file format: round trip, and a clear error for each kind of bad file.
import { describe, expect, it } from 'vitest';
import { EMPTY_WORKSPACE, parseWorkspace, serializeWorkspace, WorkspaceReadError, type WorkspaceContent } from '../../../shared/workspace/format';
import { normaliseMctOverrides } from '../../../shared/workspace/settings';

const content: WorkspaceContent = {
  tripsText: 'traveler,trip,flight,from,depart,to,arrive\nAda,T,UA 1,ORD,2026-03-08 07:00,BOS,10:30\n',
  settings: { ...EMPTY_WORKSPACE.settings, targetProbability: 0.95, mctOverrides: [{ airport: 'ORD', connectionType: 'domestic', minutes: 50 }] },
  bundleId: null,
  theme: 'dark',
};

function readError(text: string): WorkspaceReadError {
  try {
    parseWorkspace(text);
  } catch (err) {
    if (err instanceof WorkspaceReadError) return err;
    throw err;
  }
  throw new Error('expected a WorkspaceReadError');
}

describe('workspace format', () => {
  it('reads back exactly what it wrote, with the save time', () => {
    const text = serializeWorkspace(content, new Date('2026-02-03T04:05:06Z'));
    expect(JSON.parse(text)).toMatchObject({ format: 'layline-workspace', version: 1, savedAt: '2026-02-03T04:05:06.000Z' });
    expect(parseWorkspace(text)).toEqual({ content, savedAt: '2026-02-03T04:05:06.000Z' });
  });

  it.each([
    ['', 'empty', /empty/],
    ['{"format": "layline-workspace", "version": 1, "content": {', 'not-json', /not valid JSON/],
    ['{"name":"package"}', 'not-a-workspace', /not a Layline workspace/],
    ['{"format":"layline-workspace","version":7}', 'newer-version', /newer Layline \(format version 7\)/],
  ] as const)('rejects %j as %s', (text, kind, message) => {
    const err = readError(text);
    expect(err.kind).toBe(kind);
    expect(err.message).toMatch(message);
  });

  it('names the damaged field', () => {
    const good = JSON.parse(serializeWorkspace(content, new Date())) as { content: { settings: { targetProbability: number } } };
    good.content.settings.targetProbability = 7;
    const err = readError(JSON.stringify(good));
    expect(err.kind).toBe('invalid');
    expect(err.message).toContain('content.settings.targetProbability');
  });

  it('refuses unknown fields rather than dropping them silently', () => {
    const good = JSON.parse(serializeWorkspace(content, new Date())) as { content: Record<string, unknown> };
    good.content.surprise = true;
    expect(readError(JSON.stringify(good)).kind).toBe('invalid');
  });

  it('keeps one MCT override per airport and type, the later one winning', () => {
    expect(
      normaliseMctOverrides([
        { airport: 'ORD', connectionType: 'domestic', minutes: 50 },
        { airport: 'ATL', connectionType: 'domestic', minutes: 40 },
        { airport: 'ORD', connectionType: 'domestic', minutes: 55 },
      ]),
    ).toEqual([
      { airport: 'ATL', connectionType: 'domestic', minutes: 40 },
      { airport: 'ORD', connectionType: 'domestic', minutes: 55 },
    ]);
  });
});
