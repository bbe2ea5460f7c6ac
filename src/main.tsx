/** Entry: render the page at once, then restore the autosaved session or load the demo. */
import './ui/zodConfig';
import { startTransition, StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { bootstrap } from './state/bootstrap';
import { App } from './ui/App';
import './ui/theme.css';

const root = document.getElementById('root');
if (!root) throw new Error('main: the page has no #root element');
// The first render is a transition: React renders the page in slices of a few milliseconds and
// yields in between, instead of one long task while the demo and plotly are loading.
const reactRoot = createRoot(root);
startTransition(() =>
  reactRoot.render(
    <StrictMode>
      <App />
    </StrictMode>,
  ),
);
// `?demo=single` starts on the single-band demo (the browser tests use it); else the several-band one.
void bootstrap(new URLSearchParams(window.location.search).get('demo') === 'single' ? 'single' : 'bands');
