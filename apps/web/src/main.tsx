import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Fira Sans ships with the app: the font files are bundled, nothing is fetched from elsewhere.
import '@fontsource/fira-sans/400.css';
import '@fontsource/fira-sans/500.css';
import '@fontsource/fira-sans/600.css';
import '@fontsource/fira-sans/700.css';
import './styles/app.css';
import { App } from './app/index.tsx';

const rootElement = document.getElementById('root');
if (!rootElement) throw new Error('index.html has no #root element to mount Plumbline into');

createRoot(rootElement).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
