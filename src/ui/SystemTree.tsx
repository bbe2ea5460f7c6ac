/**
 * The model as species → states → bands (several-band session), with each state's main constants
 * editable, and two short forms: add an isotopologue (constants scaled from a parent) and add a
 * hot band (a new state on an excited one). A single-band session gets a button that makes it a
 * several-band one, and one that opens the two-isotopologue demo.
 */
import { useState } from 'react';
import { messagePost } from '../state/actionsCore';
import { demoSystemOpen } from '../state/actionsDemoSystem';
import { bandActivate, systemEdit, systemFromSession } from '../state/actionsSystem';
import { useBench } from '../state/store';
import {
  systemAddHotBand,
  systemAddIsotopologue,
  systemKeyWithSpecies,
  systemSetConstant,
  systemSetInteractionConstant,
  systemSetSpecies,
  isotopologueFactorDefault,
} from '../state/systemEdit';
import { systemEntriesOf } from '../state/systemSync';
import { systemInteractionConstantNames, systemParamKey, systemStateConstantNames } from '../state/systemBands';
import { constantNameText } from '../io/constantName';
import type { SystemInteraction, SystemSpecies, SystemState } from '../physics/system/systemModel';
import { NumberField } from './NumberField';
import { bandColour } from './plot/plotColours';

/** Constants shown per state whether given or not; every other constant the state uses is shown when the model gives it. */
const TREE_CONSTANTS: readonly string[] = ['origin', 'B', 'A', 'C', 'zeta'];

/** A constant's field label: its name and state ("q_22 of v4"); the origin is the state's term value G. */
function fieldLabel(name: string, owner: string): string {
  return `${name === 'origin' ? 'G' : constantNameText(name)} of ${owner}`;
}

/** A constant's unit in the tree (cm⁻¹ throughout; ζ has none). */
function fieldUnit(name: string): string {
  return name === 'zeta' ? '' : 'cm⁻¹';
}

/**
 * The constants of a state: the main ones and every other one the model gives it (q22, ηJ, h3, …);
 * the rest of what its Hamiltonian takes under "more", at 0.
 */
function StateConstants({ speciesIndex, species, state }: { speciesIndex: number; species: SystemSpecies; state: SystemState }) {
  const system = useBench((s) => s.system)!;
  const floated = useBench((s) => s.systemFloated);
  const names = systemStateConstantNames(species, state);
  const isFloated = new Set(floated);
  // A constant the file leaves at 0 and fixed plays no part; it waits under "more".
  const shown = names.filter(
    (n) =>
      TREE_CONSTANTS.includes(n) || (state.constants[n] ?? 0) !== 0 || isFloated.has(systemParamKey(system, speciesIndex, state.name, n)),
  );
  const rest = names.filter((n) => !shown.includes(n));
  const field = (n: string) => (
    <NumberField
      key={n}
      label={fieldLabel(n, state.name)}
      className="narrow"
      unit={fieldUnit(n)}
      value={state.constants[n] ?? 0}
      testId={`const-${species.name}-${state.name}-${n}`}
      onCommit={(v) =>
        systemEdit(
          `edit ${species.name} ${state.name}.${n}`,
          (s) => ({ system: systemSetConstant(s.system!, speciesIndex, state.name, n, v) }),
          {
            coalesce: true,
          },
        )
      }
    />
  );
  return (
    <>
      <span className="tree-fields">{shown.map(field)}</span>
      {rest.length > 0 && (
        <details className="sub tree-more">
          <summary>more constants of {state.name}</summary>
          <span className="tree-fields">{rest.map(field)}</span>
        </details>
      )}
    </>
  );
}

/** An interaction of a species with the constants it uses (the others its type takes under "more", at 0). */
function InteractionRow({
  speciesIndex,
  species,
  interaction,
}: {
  speciesIndex: number;
  species: SystemSpecies;
  interaction: SystemInteraction;
}) {
  const system = useBench((s) => s.system)!;
  const floated = useBench((s) => s.systemFloated);
  const isFloated = new Set(floated);
  const all = systemInteractionConstantNames(species, interaction);
  const isUsed = (n: string) =>
    (interaction.constants[n] ?? 0) !== 0 || isFloated.has(systemParamKey(system, speciesIndex, interaction.name, n));
  const names = all.filter(isUsed);
  const rest = all.filter((n) => !isUsed(n));
  const field = (n: string) => (
    <NumberField
      key={n}
      label={fieldLabel(n, interaction.name)}
      className="narrow"
      unit="cm⁻¹"
      value={interaction.constants[n] ?? 0}
      testId={`const-${species.name}-${interaction.name}-${n}`}
      onCommit={(v) =>
        systemEdit(
          `edit ${species.name} ${interaction.name}.${n}`,
          (s) => ({ system: systemSetInteractionConstant(s.system!, speciesIndex, interaction.name, n, v) }),
          { coalesce: true },
        )
      }
    />
  );
  return (
    <li data-interaction={interaction.name}>
      <span className="tree-state">
        {interaction.name}: {interaction.type === 'coriolis' ? 'Coriolis' : 'Fermi'} {interaction.states[0]} ↔ {interaction.states[1]}
      </span>
      <span className="tree-fields">{names.map(field)}</span>
      {rest.length > 0 && (
        <details className="sub tree-more">
          <summary>more constants of {interaction.name}</summary>
          <span className="tree-fields">{rest.map(field)}</span>
        </details>
      )}
    </li>
  );
}

function AddIsotopologue() {
  const system = useBench((s) => s.system)!;
  const [parent, setParent] = useState(0);
  const p = system.species[parent] ?? system.species[0];
  const [name, setName] = useState(`${p.name}-iso`);
  const [mass, setMass] = useState((p.massAmu ?? 50) + 1);
  const [abundance, setAbundance] = useState(Math.max(0.01, p.abundance / 3));
  const [factor, setFactor] = useState<number | null>(null);
  const [isUniqueScaled, setUniqueScaled] = useState(false);
  const f = factor ?? isotopologueFactorDefault(p.massAmu ?? mass, mass);
  const unique = p.shape === 'oblate' ? 'C' : 'A';
  return (
    <form
      className="tree-form"
      aria-label="Add an isotopologue"
      onSubmit={(e) => {
        e.preventDefault();
        let note = '';
        const why = systemEdit(`add isotopologue ${name}`, (s) => {
          const r = systemAddIsotopologue(s.system!, s.systemFloated, {
            parentIndex: parent,
            name,
            massAmu: mass,
            abundance,
            rotationalFactor: f,
            isUniqueScaled,
          });
          note = r.note;
          const ties = Object.fromEntries(
            Object.entries(s.systemTies).map(([k, v]) => [systemKeyWithSpecies(k, s.system!), systemKeyWithSpecies(v, s.system!)]),
          );
          return { system: r.system, floated: r.floated, ties };
        });
        messagePost(why ? 'error' : 'info', why ? `The isotopologue was not added: ${why}.` : note);
      }}
    >
      <label>
        Parent
        <select value={parent} onChange={(e) => setParent(Number(e.target.value))}>
          {system.species.map((sp, i) => (
            <option key={sp.name} value={i}>
              {sp.name}
            </option>
          ))}
        </select>
      </label>
      <label>
        Name
        <input value={name} onChange={(e) => setName(e.target.value)} data-testid="iso-name" />
      </label>
      <NumberField label="Mass / amu" value={mass} onCommit={(v) => (v > 0 ? (setMass(v), null) : 'a mass > 0 amu')} />
      <NumberField label="Abundance" value={abundance} onCommit={(v) => (v >= 0 ? (setAbundance(v), null) : 'an abundance >= 0')} />
      <NumberField
        label="Factor on B"
        value={Number(f.toPrecision(6))}
        onCommit={(v) => (v > 0.2 && v < 5 ? (setFactor(v), null) : 'a factor between 0.2 and 5')}
      />
      <label className="check">
        <input type="checkbox" checked={isUniqueScaled} onChange={(e) => setUniqueScaled(e.target.checked)} />
        scale {unique} too (substituted atom off the symmetry axis)
      </label>
      <p className="hint">
        Default factor m/m′ = {p.massAmu ?? '?'}/{mass}: as if every moment of inertia grew with the whole mass — an estimate (an atom near
        the centre of mass changes B much less). Origins scale by √factor, distortion constants by factor². Refine by fitting.
      </p>
      <button type="submit">Add isotopologue</button>
    </form>
  );
}

function AddHotBand() {
  const system = useBench((s) => s.system)!;
  const [speciesIndex, setSpeciesIndex] = useState(0);
  const sp = system.species[speciesIndex] ?? system.species[0];
  const excited = sp.states.filter((st) => (st.constants.origin ?? 0) > 0);
  const fundamentals = sp.bands.filter(
    (b) => (sp.states.find((st) => st.name === b.lower)?.constants.origin ?? 0) === 0 && b.upper !== b.lower,
  );
  const [lower, setLower] = useState('');
  const [fundamental, setFundamental] = useState('');
  const [name, setName] = useState('hot');
  const lo = lower || excited[0]?.name || '';
  const fu = fundamental || fundamentals[0]?.name || '';
  return (
    <form
      className="tree-form"
      aria-label="Add a hot band"
      onSubmit={(e) => {
        e.preventDefault();
        let note = '';
        const why = systemEdit(`add hot band ${name}`, (s) => {
          const r = systemAddHotBand(s.system!, s.systemFloated, { speciesIndex, lower: lo, fundamental: fu, name });
          note = r.note;
          return { system: r.system, floated: r.floated };
        });
        messagePost(why ? 'error' : 'info', why ? `The hot band was not added: ${why}.` : note);
      }}
    >
      <label>
        Species
        <select value={speciesIndex} onChange={(e) => setSpeciesIndex(Number(e.target.value))}>
          {system.species.map((x, i) => (
            <option key={x.name} value={i}>
              {x.name}
            </option>
          ))}
        </select>
      </label>
      <label>
        From state
        <select value={lo} onChange={(e) => setLower(e.target.value)}>
          {excited.map((st) => (
            <option key={st.name} value={st.name}>
              {st.name}
            </option>
          ))}
        </select>
      </label>
      <label>
        Adding the quantum of
        <select value={fu} onChange={(e) => setFundamental(e.target.value)}>
          {fundamentals.map((b) => (
            <option key={b.name} value={b.name}>
              {b.name} ({b.upper})
            </option>
          ))}
        </select>
      </label>
      <label>
        Band name
        <input value={name} onChange={(e) => setName(e.target.value)} />
      </label>
      {excited.length === 0 && <p className="hint">Add an excited state first (a hot band starts from one).</p>}
      <p className="hint">
        New state: origin G(v) + G(v′) (anharmonicity neglected), B and A (C) as X(v) + X(v′) − X(0), distortion and ζ copied. Estimates to
        refine.
      </p>
      <button type="submit" disabled={excited.length === 0 || fundamentals.length === 0}>
        Add hot band
      </button>
    </form>
  );
}

export function SystemTree() {
  const system = useBench((s) => s.system);
  const active = useBench((s) => s.activeBandKey);
  const isDark = useBench((s) => s.theme === 'dark');
  if (!system)
    return (
      <details className="sub system-tree" data-testid="system-tree">
        <summary>Several bands</summary>
        <p className="hint">Fit hot bands and isotopologues together with this band: one model of species → states → bands.</p>
        <button type="button" onClick={systemFromSession}>
          Make this a several-band model
        </button>{' '}
        <button type="button" onClick={() => void demoSystemOpen()}>
          Open the two-isotopologue demo
        </button>
      </details>
    );
  const entries = systemEntriesOf(system);
  return (
    <details className="sub system-tree" open data-testid="system-tree">
      <summary>
        Species, states and bands ({system.species.length} species, {entries.length} bands)
      </summary>
      <ul className="tree">
        {system.species.map((sp, si) => (
          <li key={sp.name} data-species={sp.name}>
            <strong>{sp.name}</strong> <span className="muted">{sp.shape}</span>
            <span className="tree-fields">
              <NumberField
                label={`Abundance of ${sp.name}`}
                className="narrow"
                value={sp.abundance}
                onCommit={(v) =>
                  systemEdit(`abundance of ${sp.name}`, (s) => ({ system: systemSetSpecies(s.system!, si, 'abundance', v) }), {
                    coalesce: true,
                  })
                }
              />
              <NumberField
                label={`Mass of ${sp.name} / amu`}
                className="narrow"
                value={sp.massAmu ?? NaN}
                onCommit={(v) =>
                  systemEdit(`mass of ${sp.name}`, (s) => ({ system: systemSetSpecies(s.system!, si, 'massAmu', v) }), { coalesce: true })
                }
              />
            </span>
            <ul>
              {sp.states.map((st) => (
                <li key={st.name} data-state={st.name}>
                  <span className="tree-state">
                    {st.name}
                    {st.isDegenerate ? ' (degenerate)' : ''}
                  </span>
                  {st.symmetry && (
                    <span className="muted" data-testid="state-symmetry">
                      {' '}
                      {st.symmetry.vibSpecies}
                      {st.symmetry.isInversionDoubled ? ', s/a pairs' : ''}
                    </span>
                  )}
                  <StateConstants speciesIndex={si} species={sp} state={st} />
                </li>
              ))}
            </ul>
            {(sp.interactions ?? []).length > 0 && (
              <ul>
                {sp.interactions!.map((it) => (
                  <InteractionRow key={it.name} speciesIndex={si} species={sp} interaction={it} />
                ))}
              </ul>
            )}
            <ul>
              {sp.bands.map((b) => {
                const key = `${sp.name}/${b.name}`;
                const index = entries.findIndex((e) => e.key === key);
                const e = entries[index];
                return (
                  <li key={b.name} data-band={key}>
                    <span className="band-swatch" style={{ background: bandColour(index, isDark) }} aria-hidden="true" /> band {b.name}:{' '}
                    {b.upper} ← {b.lower}
                    {key === active ? (
                      <span className="muted"> (in the panels)</span>
                    ) : (
                      <button
                        type="button"
                        className="band-activate"
                        disabled={!e?.view}
                        title={e?.viewWhyNot ?? ''}
                        onClick={() => {
                          const why = bandActivate(key);
                          if (why) messagePost('info', why);
                        }}
                      >
                        to panels
                      </button>
                    )}
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ul>
      <details className="sub">
        <summary>Add an isotopologue</summary>
        <AddIsotopologue />
      </details>
      <details className="sub">
        <summary>Add a hot band</summary>
        <AddHotBand />
      </details>
    </details>
  );
}
