// Intake: the trips text, its problems listed by line, and file import by dialog or drop.
import { useMemo, useRef, useState } from 'preact/hooks';
import type { Analysis } from '../../shared/api/analysis-schema';
import { count } from '../app/format';

export interface IntakeViewProps {
  readonly text: string;
  readonly analysis: Analysis | null;
  readonly busy: boolean;
  /** `immediate` asks for a re-parse without the typing debounce (paste, drop, import). */
  readonly onText: (text: string, immediate: boolean) => void;
  readonly onImport: () => void;
  readonly onDropFile: (file: File) => void;
  readonly onLoadDemo: () => void;
}

/** Character range of 1-based line `line` in `text`. */
export function lineRange(text: string, line: number): [number, number] {
  let start = 0;
  for (let i = 1; i < line; i++) {
    const next = text.indexOf('\n', start);
    if (next === -1) return [text.length, text.length];
    start = next + 1;
  }
  const end = text.indexOf('\n', start);
  return [start, end === -1 ? text.length : end];
}

export function IntakeView({ text, analysis, busy, onText, onImport, onDropFile, onLoadDemo }: IntakeViewProps) {
  const area = useRef<HTMLTextAreaElement>(null);
  const gutter = useRef<HTMLPreElement>(null);
  const [dragging, setDragging] = useState(false);
  const lineCount = useMemo(() => text.split('\n').length, [text]);
  const numbers = useMemo(() => Array.from({ length: Math.max(lineCount, 1) }, (_, i) => i + 1).join('\n'), [lineCount]);
  const problems = analysis?.problems ?? [];
  const errors = problems.filter((p) => p.severity === 'error').length;
  const legs = analysis?.trips.reduce((n, t) => n + t.legs.length, 0) ?? 0;

  const selectLine = (line: number) => {
    const el = area.current;
    if (!el || line < 1) return;
    const [start, end] = lineRange(el.value, line);
    el.focus();
    el.setSelectionRange(start, end);
    const lineHeight = parseFloat(getComputedStyle(el).lineHeight) || 20;
    el.scrollTop = Math.max(0, (line - 3) * lineHeight);
  };

  return (
    <section class="intake" aria-labelledby="intake-title">
      <div class="intake-head">
        <h2 id="intake-title">Trips text</h2>
        <p class="hint">
          Paste spreadsheet rows (CSV or TSV with a header: traveler, trip, option, flight, from, depart, to, arrive, booking, deadline), lines copied from itinerary e-mails, or
          drop a .csv, .tsv, .txt or .ics file here. Times are local to each airport.
        </p>
        <div class="button-row">
          <button type="button" onClick={onImport}>
            Import file…
          </button>
          <button type="button" onClick={onLoadDemo}>
            Load the demo workspace
          </button>
        </div>
      </div>
      <div class="intake-body">
        <div
          class={`editor${dragging ? ' dragging' : ''}`}
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={(e) => {
            e.preventDefault();
            setDragging(false);
            const file = e.dataTransfer?.files[0];
            if (file) onDropFile(file);
          }}
        >
          <pre class="gutter" ref={gutter} aria-hidden="true">
            {numbers}
          </pre>
          <textarea
            ref={area}
            aria-label="Trips text"
            spellcheck={false}
            wrap="off"
            value={text}
            onScroll={(e) => {
              if (gutter.current) gutter.current.scrollTop = (e.currentTarget as HTMLTextAreaElement).scrollTop;
            }}
            onInput={(e) => {
              const inputType = (e as InputEvent).inputType ?? '';
              onText((e.currentTarget as HTMLTextAreaElement).value, inputType === 'insertFromPaste' || inputType === 'insertFromDrop');
            }}
            placeholder={'traveler,trip,flight,from,depart,to,arrive\nAda Quill,Offsite,UA 1184,DFW,2026-03-08 15:10,ORD,17:35\n…'}
          />
        </div>
        <aside class="problems" aria-labelledby="problems-title">
          <h3 id="problems-title">Problems</h3>
          <p role="status" data-testid="intake-summary">
            {busy && !analysis ? 'Reading…' : analysis ? `${count(analysis.trips.length, 'trip')}, ${count(legs, 'leg')} read (${analysis.format}); ${problems.length === 0 ? 'no problems' : `${count(errors, 'error')}, ${count(problems.length - errors, 'warning')}`}.` : 'Nothing read yet.'}
          </p>
          {problems.length > 0 && (
            <ul class="problem-list">
              {problems.map((p, i) => (
                <li key={`${p.line}-${p.code}-${i}`}>
                  <button type="button" class={`problem ${p.severity}`} onClick={() => selectLine(p.line)} aria-label={`Line ${p.line}, ${p.severity}: ${p.message}`}>
                    <span class="problem-line">{p.line > 0 ? `Line ${p.line}` : 'Input'}</span>
                    <span class="problem-severity">{p.severity === 'error' ? 'Error' : 'Warning'}</span>
                    <span class="problem-message">{p.message}</span>
                  </button>
                </li>
              ))}
            </ul>
          )}
        </aside>
      </div>
    </section>
  );
}
