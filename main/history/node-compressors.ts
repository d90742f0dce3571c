// The Parquet codecs Node's zlib adds to the shared reader's Snappy and ZSTD.
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import type { Compressors } from 'hyparquet';

export const NODE_COMPRESSORS: Compressors = {
  GZIP: (input) => new Uint8Array(gunzipSync(input)),
  BROTLI: (input) => new Uint8Array(brotliDecompressSync(input)),
};
