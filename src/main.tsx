import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App, fetchOpeningScreen } from './app/App';
import { setOpeningDraw } from './components/row-window';
import './app/app.css';
// The default opening screen's styles come with the page's own: its code then loads without a
// stylesheet of its own to fetch and wait for, and the page's style is worked out once.
import './features/library/library.css';

const root = document.getElementById('root');
if (!root) throw new Error('Blendbench: #root element missing from index.html');
// The first screen drawn is the page's opening screen (what is below the window may follow its first
// paint); its code is fetched from here on, beside the shell's first render.
setOpeningDraw(true);
void fetchOpeningScreen();
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
