// What the engine thread tells its scoring helper about the bundle in use: the choice (the
// bundle that ships with the app, or a fitted one by id) and the selection's generation, which
// changes whenever the choice does.
import type { ActiveBundle } from '../../shared/history/bundle-store';

export interface EngineSourceSpec {
  readonly choice: ActiveBundle;
  readonly generation: number;
}

export function checkEngineSourceSpec(spec: unknown): EngineSourceSpec {
  const s = spec as Partial<EngineSourceSpec> | null;
  const choice = s?.choice as { kind?: unknown; id?: unknown } | undefined;
  const known = choice?.kind === 'default' || (choice?.kind === 'library' && typeof choice.id === 'string' && choice.id !== '');
  if (!known || !Number.isInteger(s?.generation)) throw new TypeError(`not a bundle the scoring helper knows: ${JSON.stringify(spec)}`);
  return s as EngineSourceSpec;
}
