/**
 * The bands of a several-band session above the plot: each band's colour, an on/off switch for its
 * ladders, and a choice of the band the one-band panels (model constants, Loomis–Wood, keyboard
 * walk) show.
 */
import { memo } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { messagePost } from '../state/actionsCore';
import { bandActivate, bandToggle } from '../state/actionsSystem';
import { useBench } from '../state/store';
import { systemEntriesOf } from '../state/systemSync';
import { bandColour } from './plot/plotColours';

// Memoised: it reads the store itself, so the plot's re-render on every click does not render it again.
export const BandSwitches = memo(function BandSwitches() {
  const system = useBench((s) => s.system);
  const { hidden, active, isDark } = useBench(
    useShallow((s) => ({ hidden: s.hiddenBands, active: s.activeBandKey, isDark: s.theme === 'dark' })),
  );
  if (!system) return null;
  const entries = systemEntriesOf(system);
  return (
    <div className="band-switches" role="group" aria-label="Bands" data-testid="band-switches">
      {entries.map((e, i) => {
        const isOn = !hidden.includes(e.key);
        return (
          <span key={e.key} className={`band-switch ${e.key === active ? 'is-active' : ''}`} data-band={e.key}>
            <span className="band-swatch" style={{ background: bandColour(i, isDark) }} aria-hidden="true" />
            <label title={isOn ? 'Ladders shown; untick to hide them (the band stays in the simulated sum)' : 'Ladders hidden'}>
              <input
                type="checkbox"
                checked={isOn}
                onChange={() => bandToggle(e.key)}
                aria-label={`Show the ladders of band ${e.band} (${e.species})`}
              />
              {e.band}
            </label>
            <span className="muted"> {e.species}</span>
            <button
              type="button"
              className="band-activate"
              aria-pressed={e.key === active}
              disabled={!e.view}
              title={e.view ? 'Show this band in the model, Loomis–Wood and keyboard walk' : (e.viewWhyNot ?? '')}
              onClick={() => {
                const why = bandActivate(e.key);
                if (why) messagePost('info', why);
              }}
            >
              {e.key === active ? 'in panels' : 'to panels'}
            </button>
          </span>
        );
      })}
    </div>
  );
});
