import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Latin and Latin Extended only: enough for our names, and nothing is fetched from elsewhere.
import '@fontsource/fira-sans/latin-400.css';
import '@fontsource/fira-sans/latin-500.css';
import '@fontsource/fira-sans/latin-600.css';
import '@fontsource/fira-sans/latin-ext-400.css';
import '@fontsource/fira-sans/latin-ext-500.css';
import '@fontsource/fira-sans/latin-ext-600.css';
import './index.css';
import { App } from './app/app.tsx';

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
