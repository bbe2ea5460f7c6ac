/** Model panel: shape, band type (or from symmetry), constants of both states with float/fix, temperature, limits, spin weights, simulation widths. */
import { useRef, useState } from 'react';
import { bandSymmetryPointGroups, bandSymmetrySpecies } from '../physics/bandSymmetry';
import { MHZ_PER_CM1 } from '../physics/constants';
import type { BandType, ParameterName, TopShape } from '../physics/model';
import {
  modelLoadText,
  modelParameterNames,
  modelSetBand,
  modelSetConstant,
  modelSetConstantMhz,
  modelSetFloated,
  modelSetMinIntensity,
  modelSetScalar,
  modelSetShape,
  modelSetSimulation,
  modelSetSpinWeights,
  modelSetSymmetry,
} from '../state/actionsModel';
import { useBench } from '../state/store';
import { NumberField } from './NumberField';

const NAME_TEXT: Record<string, string> = {
  origin: 'ν₀ origin',
  B: 'B',
  A: 'A',
  C: 'C',
  DJ: 'D_J',
  DJK: 'D_JK',
  DK: 'D_K',
  HJ: 'H_J',
  HJK: 'H_JK',
  HKJ: 'H_KJ',
  HK: 'H_K',
  zeta: 'ζ (Coriolis)',
  q: 'q (l-doubling)',
};

/** Constants shown to 12 significant digits (the stored value keeps full precision until edited). */
const showConstant = (v: number) => String(Number(v.toPrecision(12)));

const ORDER: ParameterName[] = ['origin', 'B', 'A', 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK', 'zeta', 'q'];

function ConstantName({ name }: { name: string }) {
  const t = NAME_TEXT[name] ?? name;
  const [base, sub] = t.split('_');
  return (
    <>
      {base}
      {sub && <sub>{sub}</sub>}
    </>
  );
}

function SymmetryChooser() {
  const symmetry = useBench((s) => s.symmetry);
  const [pg, setPg] = useState(symmetry?.pointGroup ?? '');
  const [note, setNote] = useState<{ ok: boolean; text: string } | null>(null);
  const groups = bandSymmetryPointGroups();
  const species = pg ? bandSymmetrySpecies(pg) : [];
  return (
    <div className="symmetry">
      <label>
        Point group
        <select value={pg} onChange={(e) => (setPg(e.target.value), setNote(null))}>
          <option value="">(choose)</option>
          {groups.map((g) => (
            <option key={g} value={g}>
              {g}
            </option>
          ))}
        </select>
      </label>
      <label>
        Vib. species
        <select
          value={symmetry?.pointGroup === pg ? symmetry.species : ''}
          disabled={!pg}
          onChange={(e) => e.target.value && setNote(modelSetSymmetry({ pointGroup: pg, species: e.target.value }))}
        >
          <option value="">(choose)</option>
          {species.map((sp) => (
            <option key={sp} value={sp}>
              {sp}
            </option>
          ))}
        </select>
      </label>
      {note && <p className={note.ok ? 'muted small' : 'inline-error small'}>{note.text}</p>}
    </div>
  );
}

export function ModelPanel() {
  const model = useBench((s) => s.model);
  const floated = useBench((s) => s.floated);
  const modelName = useBench((s) => s.modelName);
  const massAmu = useBench((s) => s.massAmu);
  const lorentz = useBench((s) => s.lorentzHwhmCm1);
  const minIntensity = useBench((s) => s.minIntensity);
  const [lowerUnit, setLowerUnit] = useState<'cm-1' | 'MHz'>('cm-1');
  const fileRef = useRef<HTMLInputElement>(null);
  const lowerNames = modelParameterNames(model, 'lower');
  const upperNames = modelParameterNames(model, 'upper');
  const names = ORDER.filter((n) => lowerNames.includes(n) || upperNames.includes(n));
  const isFloated = (key: string) => floated.includes(key);

  return (
    <section className="panel model-panel" aria-labelledby="model-heading">
      <div className="panel-head">
        <h2 id="model-heading">Model</h2>
        <button type="button" onClick={() => fileRef.current?.click()}>
          Open model file…
        </button>
        <input
          ref={fileRef}
          type="file"
          accept=".json,application/json"
          className="visually-hidden"
          aria-label="Model file"
          data-testid="model-file-input"
          onChange={async (e) => {
            const f = e.target.files?.[0];
            e.target.value = '';
            if (f) modelLoadText(await f.text(), f.name);
          }}
        />
      </div>
      <p className="model-name" title={modelName}>
        {modelName}
      </p>
      <div className="form-grid">
        <label>
          Shape
          <select value={model.shape} onChange={(e) => modelSetShape(e.target.value as TopShape)}>
            <option value="prolate">prolate top</option>
            <option value="oblate">oblate top</option>
            <option value="linear">linear</option>
          </select>
        </label>
        <label>
          Band
          <select value={model.band} onChange={(e) => modelSetBand(e.target.value as BandType)}>
            <option value="parallel">parallel (ΔK = 0)</option>
            <option value="perpendicular">perpendicular (ΔK = ±1)</option>
          </select>
        </label>
      </div>
      <details className="sub">
        <summary>Band type from symmetry</summary>
        <SymmetryChooser />
      </details>
      <div className="form-grid three">
        <NumberField label="T / K" value={model.temperatureK} onCommit={(v) => modelSetScalar('temperatureK', v)} />
        <NumberField label="J″ max" value={model.jMax} onCommit={(v) => modelSetScalar('jMax', v)} />
        <NumberField label="K″ max" value={model.kMax} isDisabled={model.shape === 'linear'} onCommit={(v) => modelSetScalar('kMax', v)} />
      </div>
      <div className="form-grid">
        <SpinWeights weights={model.spinWeights} />
        <NumberField label="Intensity cut" value={minIntensity} onCommit={modelSetMinIntensity} />
      </div>
      <table className="constants">
        <caption className="visually-hidden">Constants of the lower and upper state; tick "fit" to float a constant</caption>
        <thead>
          <tr>
            <th scope="col">Constant</th>
            <th scope="col">
              Lower ″{' '}
              <button
                type="button"
                className="unit-toggle"
                onClick={() => setLowerUnit(lowerUnit === 'cm-1' ? 'MHz' : 'cm-1')}
                aria-label={`Lower-state unit: ${lowerUnit === 'cm-1' ? 'cm⁻¹' : 'MHz'}; switch`}
                data-testid="lower-unit"
              >
                {lowerUnit === 'cm-1' ? 'cm⁻¹' : 'MHz'}
              </button>
            </th>
            <th scope="col" title="Float in the fit">
              fit
            </th>
            <th scope="col">Upper ′ / cm⁻¹</th>
            <th scope="col" title="Float in the fit">
              fit
            </th>
          </tr>
        </thead>
        <tbody>
          {names.map((name) => (
            <tr key={name}>
              <th scope="row">
                <ConstantName name={name} />
              </th>
              {lowerNames.includes(name) ? (
                <>
                  <td>
                    {lowerUnit === 'cm-1' || name === 'zeta' ? (
                      <NumberField
                        key="cm"
                        label={`Lower ${name} in cm⁻¹`}
                        isLabelHidden
                        value={model.lower[name]}
                        format={showConstant}
                        onCommit={(v) => modelSetConstant('lower', name, v)}
                        testId={`lower-${name}`}
                      />
                    ) : (
                      <NumberField
                        key="mhz"
                        label={`Lower ${name} in MHz`}
                        isLabelHidden
                        value={model.lower[name] * MHZ_PER_CM1}
                        format={(v) => String(Number(v.toPrecision(12)))}
                        onCommit={(v) => modelSetConstantMhz(name, v)}
                        testId={`lower-${name}-mhz`}
                      />
                    )}
                  </td>
                  <td>
                    <input
                      type="checkbox"
                      aria-label={`Float lower ${name} in the fit`}
                      checked={isFloated(`lower.${name}`)}
                      onChange={(e) => modelSetFloated(`lower.${name}`, e.target.checked)}
                    />
                  </td>
                </>
              ) : (
                <>
                  <td className="muted">—</td>
                  <td />
                </>
              )}
              {upperNames.includes(name) ? (
                <>
                  <td>
                    <NumberField
                      label={`Upper ${name}${name === 'zeta' ? '' : ' in cm⁻¹'}`}
                      isLabelHidden
                      value={model.upper[name]}
                      format={showConstant}
                      onCommit={(v) => modelSetConstant('upper', name, v)}
                      testId={`upper-${name}`}
                    />
                  </td>
                  <td>
                    <input
                      type="checkbox"
                      aria-label={`Float upper ${name} in the fit`}
                      checked={isFloated(`upper.${name}`)}
                      onChange={(e) => modelSetFloated(`upper.${name}`, e.target.checked)}
                    />
                  </td>
                </>
              ) : (
                <>
                  <td className="muted">—</td>
                  <td />
                </>
              )}
            </tr>
          ))}
        </tbody>
      </table>
      <h3>Simulated spectrum</h3>
      <div className="form-grid">
        <NumberField label="Mass / amu" value={massAmu} onCommit={(v) => modelSetSimulation('massAmu', v)} />
        <NumberField label="Lorentz HWHM / cm⁻¹" value={lorentz} onCommit={(v) => modelSetSimulation('lorentzHwhmCm1', v)} />
      </div>
    </section>
  );
}

function SpinWeights({ weights }: { weights: number[] }) {
  const [draft, setDraft] = useState(weights.join(', '));
  const [error, setError] = useState<string | null>(null);
  const [isFocused, setFocused] = useState(false);
  const shown = isFocused ? draft : weights.join(', ');
  return (
    <span className={`number-field ${error ? 'invalid' : ''}`}>
      <label>
        Spin weights g(K″ mod n)
        <input
          type="text"
          value={shown}
          aria-invalid={error ? true : undefined}
          onFocus={() => (setDraft(weights.join(', ')), setFocused(true))}
          onBlur={() => (setFocused(false), setError(null))}
          onChange={(e) => {
            setDraft(e.target.value);
            setError(modelSetSpinWeights(e.target.value));
          }}
        />
      </label>
      {error && (
        <span className="field-error" role="alert">
          {error}
        </span>
      )}
    </span>
  );
}
