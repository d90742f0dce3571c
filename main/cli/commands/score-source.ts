// Where `layline score` gets its posteriors: a bundle file given with --bundle, or the bundled one.
import type { PosteriorSource } from '../../../shared/delay/predictive';
import { loadDefaultPosteriorSource } from '../../../shared/delay/bundle/default-bundle';
import { parsePosteriorBundle } from '../../../shared/delay/bundle/posterior-source';
import { CliFailure, type CliIo } from '../io';

export async function loadPosteriorSource(bundlePath: string | undefined, io: CliIo): Promise<PosteriorSource> {
  if (bundlePath === undefined) {
    try {
      return loadDefaultPosteriorSource();
    } catch (err) {
      throw new CliFailure(`the bundled posteriors cannot be read: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  const text = await io.readInput(bundlePath);
  try {
    return parsePosteriorBundle(text);
  } catch (err) {
    throw new CliFailure(`bad posterior bundle ${bundlePath}: ${err instanceof Error ? err.message : String(err)}`);
  }
}
