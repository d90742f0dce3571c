// Splits pasted or imported text into numbered lines, the unit every problem refers to.
//
// Accepts \n, \r\n and lone \r line ends and drops a leading byte-order mark.

export interface InputLine {
  /** 1-based. */
  readonly number: number;
  readonly text: string;
}

/** Lines longer than this are reported, not parsed: no real leg needs them, and they keep regexes fast. */
export const MAX_LINE_LENGTH = 4000;

export function splitLines(text: string): InputLine[] {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  return body.split(/\r\n|\r|\n/).map((t, i) => ({ number: i + 1, text: t }));
}

export function isBlank(text: string): boolean {
  return text.trim() === '';
}

/** A line shortened for a message. */
export function excerpt(text: string, max = 60): string {
  const t = text.trim().replace(/\s+/g, ' ');
  return t.length > max ? t.slice(0, max - 1) + '…' : t;
}
