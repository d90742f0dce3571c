// Where route tables keep their arrays (delay-table.ts): views of large chunks, handed out zeroed.
//
// A scoring run builds thousands of tables; each typed array of its own would get its own
// off-heap store, which V8 allocates, zeroes and tracks one by one, and that cost about as much
// as filling them. Views of shared chunks avoid that, but a run still asked the system for about
// 25 MB of fresh, zeroed memory (the bundled benchmark) and let the collector find it again. A
// recycling store instead keeps its chunks: the connection work of one airport builds its tables
// from it and then hands everything back (reset), and the next airport's tables reuse the same,
// already mapped and mostly cached memory.

/** Chunk lengths, in elements: 512 KB of doubles, 64 KB of 32-bit integers. */
const FLOAT_CHUNK = 1 << 16;
const INT_CHUNK = 1 << 14;
/** A recycling store keeps at most this many chunks of each kind across a reset (16 MB of doubles). */
const KEPT_CHUNKS = 32;

class ChunkList<T extends Float64Array | Int32Array> {
  private readonly chunks: T[] = [];
  /** How much of each chunk before the current one was handed out (what reset must zero). */
  private readonly usedOf: number[] = [];
  private current = -1;
  private used = 0;

  constructor(
    private readonly make: (length: number) => T,
    private readonly chunkLength: number,
    private readonly recycles: boolean,
  ) {}

  take(length: number): T {
    // A large request gets an array of its own (never recycled): it would waste most of a chunk.
    if (length > this.chunkLength >> 2) return this.make(length);
    if (this.current < 0 || this.used + length > this.chunkLength) this.advance();
    const view = this.chunks[this.current]!.subarray(this.used, this.used + length) as T;
    this.used += length;
    return view;
  }

  private advance(): void {
    if (!this.recycles) {
      // Only the newest chunk is held: the old one is freed with the last table in it.
      this.chunks[0] = this.make(this.chunkLength);
      this.current = 0;
      this.used = 0;
      return;
    }
    if (this.current >= 0) this.usedOf[this.current] = this.used;
    this.current++;
    this.used = 0;
    if (this.current === this.chunks.length) this.chunks.push(this.make(this.chunkLength));
  }

  reset(): void {
    if (!this.recycles || this.current < 0) return;
    this.usedOf[this.current] = this.used;
    // Everything past the handed-out part is still zero, so only that part is cleared.
    for (let i = 0; i <= this.current; i++) this.chunks[i]!.fill(0, 0, this.usedOf[i]);
    if (this.chunks.length > KEPT_CHUNKS) this.chunks.length = KEPT_CHUNKS;
    this.current = 0;
    this.used = 0;
  }
}

/**
 * Zeroed arrays for route tables. A store made with `recycles` hands its memory out again after
 * reset(), which invalidates every table built from it: the owner must drop them all first
 * (pair-jobs.ts resets its store when a group of connections is solved, and nothing of the
 * group's tables outlives that). The default store never reuses memory, and tables built from it
 * live as long as they are referenced.
 */
export class TableStore {
  private readonly floatChunks: ChunkList<Float64Array>;
  private readonly intChunks: ChunkList<Int32Array>;

  constructor(readonly recycles = false) {
    this.floatChunks = new ChunkList((n) => new Float64Array(n), FLOAT_CHUNK, recycles);
    this.intChunks = new ChunkList((n) => new Int32Array(n), INT_CHUNK, recycles);
  }

  /** `length` zeroed doubles. */
  floats(length: number): Float64Array {
    return this.floatChunks.take(length);
  }

  /** `length` zeroed 32-bit integers. */
  ints(length: number): Int32Array {
    return this.intChunks.take(length);
  }

  /** Zeroes what was handed out and hands it out again (recycling stores; otherwise nothing). */
  reset(): void {
    this.floatChunks.reset();
    this.intChunks.reset();
  }
}

/** The store of tables that nobody resets: those built outside a scoring run's group work. */
export const LASTING_TABLES = new TableStore();
