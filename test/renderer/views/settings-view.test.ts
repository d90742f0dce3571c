// The MCT override table's rows as the user typed them, checked before they are applied.
import { describe, expect, it } from 'vitest';
import { parseDraft } from '../../../renderer/views/settings-view';

describe('parseDraft', () => {
  it('accepts lower-case codes and keeps one row per airport and type', () => {
    expect(
      parseDraft([
        { airport: 'ord', connectionType: 'domestic', minutes: '50' },
        { airport: 'ORD', connectionType: 'domestic', minutes: '55' },
        { airport: 'JFK', connectionType: 'international-arrival', minutes: '120' },
      ]),
    ).toEqual({
      ok: true,
      rows: [
        { airport: 'JFK', connectionType: 'international-arrival', minutes: 120 },
        { airport: 'ORD', connectionType: 'domestic', minutes: 55 },
      ],
    });
  });

  it.each([
    [{ airport: 'O1', connectionType: 'domestic', minutes: '45' }, /Row 1: airport/],
    [{ airport: 'ORD', connectionType: 'domestic', minutes: '-5' }, /Row 1: minutes/],
    [{ airport: 'ORD', connectionType: 'domestic', minutes: '45.5' }, /Row 1: minutes/],
    [{ airport: 'ORD', connectionType: 'sideways', minutes: '45' }, /Row 1: connectionType/],
  ])('names the row and field of %j', (row, message) => {
    const r = parseDraft([row]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});
