/** Entry: render the page at once, then restore the autosaved session or load the demo. */
import './ui/zodConfig';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { bootstrap } from './state/bootstrap';
import { App } from './ui/App';
import './ui/theme.css';

const root = document.getElementById('root');
if (!root) throw new Error('main: the page has no #root element');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
void bootstrap();
