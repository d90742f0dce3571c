// The model a user's history is refitted with by default: the model choice of the bundle that
// ships with Layline (issue 7: "use the route models and the model choice of the default bundle").
import { loadDefaultPosteriorSource } from '../delay/bundle/default-bundle';
import type { PosteriorBundle } from '../delay/bundle/bundle-schema';
import type { Candidate } from '../delay/bundle/fit-bundle';
import { candidateFromBundle } from './history-fit';

/** The default bundle (validated once and cached by its loader). */
export function defaultBundle(): PosteriorBundle {
  return loadDefaultPosteriorSource().bundle;
}

export function defaultHistoryCandidate(): Candidate {
  return candidateFromBundle(defaultBundle());
}
