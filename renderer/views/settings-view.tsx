// Settings: the target, MCT overrides, rebooking gap, ground-transfer allowance, theme, and
// the posterior bundle in use with its provenance.
import { useEffect, useState } from 'preact/hooks';
import * as v from 'valibot';
import type { BundleView } from '../../shared/api/analysis-schema';
import { MCT_CONNECTION_TYPES, MctOverrideSchema, normaliseMctOverrides, THEMES, type AnalysisSettings, type MctOverride, type ThemeChoice } from '../../shared/workspace/settings';
import { DEFAULT_MCT_MINUTES } from '../../shared/risk/mct';
import { NumberField } from './number-field';
import { TargetInput } from './target-input';

interface DraftRow {
  readonly airport: string;
  readonly connectionType: string;
  readonly minutes: string;
}

const THEME_WORDS: Record<ThemeChoice, string> = { system: 'Follow the system', light: 'Light', dark: 'Dark' };

function toDraft(rows: readonly MctOverride[]): DraftRow[] {
  return rows.map((r) => ({ airport: r.airport, connectionType: r.connectionType, minutes: String(r.minutes) }));
}

/** The rows as overrides, or the first problem in words with its row number. */
export function parseDraft(rows: readonly DraftRow[]): { ok: true; rows: MctOverride[] } | { ok: false; message: string } {
  const out: MctOverride[] = [];
  for (const [i, r] of rows.entries()) {
    const parsed = v.safeParse(MctOverrideSchema, { airport: r.airport.trim().toUpperCase(), connectionType: r.connectionType, minutes: Number(r.minutes) });
    if (!parsed.success) return { ok: false, message: `Row ${i + 1}: ${parsed.issues[0]?.path?.[0]?.key ?? ''} ${parsed.issues[0]?.message ?? 'invalid'}`.replace(/\s+/g, ' ') };
    out.push(parsed.output);
  }
  return { ok: true, rows: normaliseMctOverrides(out) };
}

export interface SettingsViewProps {
  readonly settings: AnalysisSettings;
  readonly theme: ThemeChoice;
  readonly bundle: BundleView | null;
  readonly bundleError: string | null;
  readonly onSettings: (patch: Partial<AnalysisSettings>, coalesceKey: string | null) => void;
  readonly onTheme: (theme: ThemeChoice) => void;
}

function MinutesField({ label, value, max, onValue }: { label: string; value: number; max: number; onValue: (n: number) => void }) {
  const parse = (t: string) => {
    const m = Number(t);
    return t.trim() !== '' && Number.isInteger(m) && m >= 0 && m <= max ? m : null;
  };
  return <NumberField label={label} value={value} format={String} parse={parse} onValue={onValue} rule={`Whole minutes from 0 to ${max}.`} min={0} max={max} step={5} />;
}

export function SettingsView({ settings, theme, bundle, bundleError, onSettings, onTheme }: SettingsViewProps) {
  const [draft, setDraft] = useState<DraftRow[]>(toDraft(settings.mctOverrides));
  useEffect(() => setDraft(toDraft(settings.mctOverrides)), [settings.mctOverrides]);
  const parsed = parseDraft(draft);
  const changed = parsed.ok && JSON.stringify(parsed.rows) !== JSON.stringify(settings.mctOverrides);
  const setRow = (i: number, patch: Partial<DraftRow>) => setDraft(draft.map((r, j) => (j === i ? { ...r, ...patch } : r)));

  return (
    <section class="settings" aria-labelledby="settings-title">
      <h2 id="settings-title">Settings</h2>
      <fieldset>
        <legend>Policy</legend>
        <TargetInput target={settings.targetProbability} onTarget={(t) => onSettings({ targetProbability: t }, 'target')} />
        <MinutesField label="Rebooking gap after a missed connection (minutes)" value={settings.rebookGapMinutes} max={2880} onValue={(n) => onSettings({ rebookGapMinutes: n }, 'rebook')} />
        <MinutesField label="Ground-transfer allowance on a change of airport (minutes)" value={settings.transferAllowanceMinutes} max={600} onValue={(n) => onSettings({ transferAllowanceMinutes: n }, 'transfer')} />
      </fieldset>
      <fieldset>
        <legend>Minimum connecting times</legend>
        <p class="hint">
          Defaults are common practice, not published values: {MCT_CONNECTION_TYPES.map((t) => `${DEFAULT_MCT_MINUTES[t]} minutes ${t.replace('-', ' ')}`).join(', ')}. IATA Resolution 765 defines the minimum
          connecting time, but airports and airlines set the actual values; enter the ones you know here.
        </p>
        <table class="plain mct-table" aria-label="MCT overrides">
          <thead>
            <tr>
              <th scope="col">Airport</th>
              <th scope="col">Connection type</th>
              <th scope="col">Minutes</th>
              <th scope="col">
                <span class="visually-hidden">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {draft.map((r, i) => (
              <tr key={i}>
                <td>
                  <input aria-label={`Airport, row ${i + 1}`} maxLength={3} size={4} value={r.airport} onInput={(e) => setRow(i, { airport: (e.currentTarget as HTMLInputElement).value.toUpperCase() })} />
                </td>
                <td>
                  <select aria-label={`Connection type, row ${i + 1}`} value={r.connectionType} onChange={(e) => setRow(i, { connectionType: (e.currentTarget as HTMLSelectElement).value })}>
                    {MCT_CONNECTION_TYPES.map((t) => (
                      <option key={t} value={t}>
                        {t.replace('-', ' ')}
                      </option>
                    ))}
                  </select>
                </td>
                <td>
                  <input aria-label={`Minutes, row ${i + 1}`} type="number" min={0} max={600} value={r.minutes} onInput={(e) => setRow(i, { minutes: (e.currentTarget as HTMLInputElement).value })} />
                </td>
                <td>
                  <button type="button" onClick={() => setDraft(draft.filter((_, j) => j !== i))} aria-label={`Remove row ${i + 1}`}>
                    Remove
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <div class="button-row">
          <button type="button" onClick={() => setDraft([...draft, { airport: '', connectionType: 'domestic', minutes: '45' }])}>
            Add an override
          </button>
          <button type="button" disabled={!changed} onClick={() => parsed.ok && onSettings({ mctOverrides: parsed.rows }, null)}>
            Apply overrides
          </button>
          {!parsed.ok && (
            <span class="field-error" role="alert">
              {parsed.message}
            </span>
          )}
        </div>
      </fieldset>
      <fieldset>
        <legend>Theme</legend>
        {THEMES.map((t) => (
          <label key={t} class="check">
            <input type="radio" name="theme" value={t} checked={theme === t} onChange={() => onTheme(t)} /> {THEME_WORDS[t]}
          </label>
        ))}
      </fieldset>
      <fieldset>
        <legend>Delay data</legend>
        {bundle ? (
          <dl class="facts" data-testid="bundle-info">
            <dt>Bundle</dt>
            <dd>{bundle.id}</dd>
            <dt>Model</dt>
            <dd>{bundle.model}</dd>
            <dt>Source</dt>
            <dd>{bundle.source}</dd>
            {bundle.provenance && (
              <>
                <dt>Data</dt>
                <dd>
                  {bundle.provenance.title}: {bundle.provenance.flights.toLocaleString('en-US')} flights on {bundle.provenance.routes.toLocaleString('en-US')} routes between {bundle.provenance.airports} airports, {bundle.provenance.dateFirst} to{' '}
                  {bundle.provenance.dateLast}
                </dd>
                <dt>Method</dt>
                <dd>{bundle.provenance.method}</dd>
                <dt>License</dt>
                <dd>{bundle.provenance.license}</dd>
              </>
            )}
          </dl>
        ) : (
          <p role="alert">{bundleError ?? 'Loading the bundle…'}</p>
        )}
        <p class="hint">Random draws use seed {settings.seed}, so the same workspace always gives the same figures.</p>
      </fieldset>
    </section>
  );
}
