import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/App';
import { setOpeningDraw } from './components/row-window';
import './app/app.css';

const root = document.getElementById('root');
if (!root) throw new Error('Blendbench: #root element missing from index.html');
// The first screen drawn is the page's opening screen (what is below the window may follow its first paint).
setOpeningDraw(true);
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
