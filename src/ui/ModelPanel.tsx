/** Model panel: shape, band type (or from symmetry), constants of both states with float/fix, temperature, limits, spin weights, simulation widths. */
import { Fragment, useRef, useState } from 'react';
import { constantDisplayUnit, constantNameText, constantToDisplayUnit, type ConstantUnit } from '../io/constantName';
import { bandSymmetryPointGroups, bandSymmetrySpecies } from '../physics/bandSymmetry';
import type { BandType, ParameterName, TopShape } from '../physics/model';
import {
  modelLoadText,
  modelParameterNames,
  modelSetBand,
  modelSetConstant,
  modelSetConstantMhz,
  modelSetConstantUnit,
  modelSetFloated,
  modelSetMinIntensity,
  modelSetScalar,
  modelSetShape,
  modelSetSimulation,
  modelSetSpinWeights,
  modelSetSymmetry,
  type ModelSide,
} from '../state/actionsModel';
import { demoSingleOpen, demoSystemOpen } from '../state/actionsDemoSystem';
import { useBench } from '../state/store';
import { ConstantName } from './ConstantName';
import { NumberField } from './NumberField';
import { SystemTree } from './SystemTree';

/**
 * A constant as typed into its field: 12 significant digits in JavaScript's own notation, so the text
 * parses back exactly as shown ("2.13475981901e-7"; never "-0"). The field is wide enough for the
 * longest such text (checked in the browser test), so no exponent is cut off.
 */
const showConstant = (v: number) => String(Number(v.toPrecision(12)) || 0);

const ORDER: ParameterName[] = ['origin', 'B', 'A', 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK', 'zeta', 'q'];

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
  const unit = useBench((s) => s.constantUnit);
  const unitText = unit === 'cm-1' ? 'cm⁻¹' : 'MHz';
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
      <p className="demo-choice" data-testid="demo-choice">
        Demo:{' '}
        <button type="button" onClick={() => void demoSingleOpen()}>
          single band
        </button>{' '}
        <button type="button" onClick={() => void demoSystemOpen()}>
          two isotopologues + hot band
        </button>
      </p>
      <SystemTree />
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
      <div
        className="unit-row"
        title="One switch for every rotational constant here and in the fit table (value and σ); ν₀ stays in cm⁻¹ and ζ has no unit"
      >
        <span className="muted small">Constants in</span>
        <button
          type="button"
          className="unit-toggle"
          onClick={() => modelSetConstantUnit(unit === 'cm-1' ? 'MHz' : 'cm-1')}
          aria-label={`Unit of the rotational constants: ${unit === 'cm-1' ? 'cm⁻¹' : 'MHz'}; switch to ${unit === 'cm-1' ? 'MHz' : 'cm⁻¹'}`}
          data-testid="lower-unit"
        >
          {unit === 'cm-1' ? 'cm⁻¹' : 'MHz'} ⇄
        </button>
        <span className="muted small">(ν₀ always cm⁻¹)</span>
      </div>
      <table className="constants">
        <caption className="visually-hidden">Constants of the lower and upper state; tick "fit" to float a constant</caption>
        <colgroup>
          <col className="c-name" />
          <col />
          <col className="c-fit" />
          <col />
          <col className="c-fit" />
        </colgroup>
        <thead>
          <tr>
            <th scope="col">
              <span className="visually-hidden">Constant</span>
            </th>
            <th scope="col">Lower ″ / {unitText}</th>
            <th scope="col" title="Float in the fit">
              fit
            </th>
            <th scope="col">Upper ′ / {unitText}</th>
            <th scope="col" title="Float in the fit">
              fit
            </th>
          </tr>
        </thead>
        <tbody>
          {names.map((name) => (
            <tr key={name}>
              <th scope="row">
                <ConstantName constantKey={name} />
                {name === 'origin' && unit === 'MHz' && <span className="muted small"> /cm⁻¹</span>}
              </th>
              {(['lower', 'upper'] as const).map((side) =>
                (side === 'lower' ? lowerNames : upperNames).includes(name) ? (
                  <ConstantCells
                    key={side}
                    side={side}
                    name={name}
                    unit={unit}
                    value={model[side][name]}
                    isFloated={isFloated(`${side}.${name}`)}
                  />
                ) : (
                  <Fragment key={side}>
                    <td className="muted">—</td>
                    <td />
                  </Fragment>
                ),
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

/** The value field and the "fit" box of one constant of one state; the field shows the chosen unit. */
function ConstantCells({
  side,
  name,
  unit,
  value,
  isFloated,
}: {
  side: ModelSide;
  name: ParameterName;
  unit: ConstantUnit;
  value: number;
  isFloated: boolean;
}) {
  const key = `${side}.${name}`;
  const shownUnit = constantDisplayUnit(key, unit);
  const nameText = constantNameText(key);
  const isMhz = shownUnit === 'MHz';
  return (
    <>
      <td>
        <NumberField
          key={isMhz ? 'mhz' : 'cm'}
          label={`${nameText}${shownUnit ? ` in ${shownUnit}` : ' (no unit)'}`}
          isLabelHidden
          value={constantToDisplayUnit(key, value, unit)}
          format={showConstant}
          onCommit={(v) => (isMhz ? modelSetConstantMhz(name, v, side) : modelSetConstant(side, name, v))}
          testId={isMhz ? `${side}-${name}-mhz` : `${side}-${name}`}
        />
      </td>
      <td>
        <input
          type="checkbox"
          aria-label={`Float ${nameText} in the fit`}
          checked={isFloated}
          onChange={(e) => modelSetFloated(key, e.target.checked)}
        />
      </td>
    </>
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
