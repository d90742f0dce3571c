// Remembers the main window's size, position and maximised state between runs, and
// puts it back only where it still fits on one of the current displays.
import { mkdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import * as v from 'valibot';
import { writeFileAtomic } from './atomic-write';

const Int = v.pipe(v.number(), v.integer());
const WindowStateSchema = v.strictObject({
  x: Int,
  y: Int,
  width: v.pipe(Int, v.minValue(200)),
  height: v.pipe(Int, v.minValue(200)),
  maximized: v.boolean(),
});
export type WindowState = v.InferOutput<typeof WindowStateSchema>;

export interface Rect {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Visible overlap of two rectangles, in pixels squared. */
function overlapArea(a: Rect, b: Rect): number {
  const w = Math.min(a.x + a.width, b.x + b.width) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.height, b.y + b.height) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

/**
 * The saved state if enough of the window (a quarter of it, and its title bar) still lands
 * on a display's work area, shrunk to that display when it is larger; otherwise null, so
 * the window opens at its default place (a monitor may have been unplugged).
 */
export function fitToDisplays(saved: WindowState, workAreas: readonly Rect[]): WindowState | null {
  let best: Rect | null = null;
  let bestArea = 0;
  for (const area of workAreas) {
    const overlap = overlapArea(saved, area);
    if (overlap > bestArea) {
      best = area;
      bestArea = overlap;
    }
  }
  if (!best || bestArea < (saved.width * saved.height) / 4) return null;
  const titleBar: Rect = { x: saved.x, y: saved.y, width: saved.width, height: 32 };
  if (overlapArea(titleBar, best) === 0) return null;
  const width = Math.min(saved.width, best.width);
  const height = Math.min(saved.height, best.height);
  const x = Math.min(Math.max(saved.x, best.x), best.x + best.width - width);
  const y = Math.min(Math.max(saved.y, best.y), best.y + best.height - height);
  return { x, y, width, height, maximized: saved.maximized };
}

export class WindowStateStore {
  private readonly file: string;

  constructor(dataDir: string) {
    this.file = path.join(dataDir, 'window-state.json');
  }

  async load(): Promise<WindowState | null> {
    try {
      const parsed = v.safeParse(WindowStateSchema, JSON.parse(await readFile(this.file, 'utf8')));
      return parsed.success ? parsed.output : null;
    } catch {
      return null;
    }
  }

  async save(state: WindowState): Promise<void> {
    await mkdir(path.dirname(this.file), { recursive: true });
    await writeFileAtomic(this.file, JSON.stringify(v.parse(WindowStateSchema, state)) + '\n');
  }
}
