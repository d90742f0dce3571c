// What the engine thread tells its scoring helper about the bundle in use (main/electron/engine-source-spec.ts).
import { describe, expect, it } from 'vitest';
import { checkEngineSourceSpec } from '../../../main/electron/engine-source-spec';

describe('checkEngineSourceSpec', () => {
  it('accepts the shipped bundle or a fitted one by id, with a generation', () => {
    expect(checkEngineSourceSpec({ choice: { kind: 'default' }, generation: 0 })).toEqual({ choice: { kind: 'default' }, generation: 0 });
    expect(checkEngineSourceSpec({ choice: { kind: 'library', id: 'b-1' }, generation: 4 }).choice).toEqual({ kind: 'library', id: 'b-1' });
  });

  it('rejects anything else, saying what it was given', () => {
    for (const bad of [null, {}, { choice: { kind: 'library', id: '' }, generation: 0 }, { choice: { kind: 'library' }, generation: 0 }, { choice: { kind: 'default' }, generation: 0.5 }, { choice: { kind: 'file' }, generation: 0 }]) {
      expect(() => checkEngineSourceSpec(bad)).toThrow(/not a bundle the scoring helper knows/);
    }
  });
});
