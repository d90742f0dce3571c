// Where `layline score` gets its posteriors: a bundle file given with --bundle, or the bundled one.
import type { PosteriorSource } from '../../../shared/delay/predictive';
import { parsePosteriorBundle } from '../../../shared/delay/bundle/posterior-source';
import { CliFailure, type CliIo } from '../io';

export async function loadPosteriorSource(bundlePath: string | undefined, io: CliIo): Promise<PosteriorSource> {
  // Until shared/delay/bundle ships its default bundle, only --bundle FILE works.
  if (bundlePath === undefined) throw new CliFailure('this build does not include a posterior bundle yet; pass one with --bundle FILE');
  const text = await io.readInput(bundlePath);
  try {
    return parsePosteriorBundle(text);
  } catch (err) {
    throw new CliFailure(`bad posterior bundle ${bundlePath}: ${err instanceof Error ? err.message : String(err)}`);
  }
}
