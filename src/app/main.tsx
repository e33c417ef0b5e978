/** Entry of the web app: mounts the React tree. All processing happens in the engine worker. */
import { createRoot } from 'react-dom/client';
import { App } from './App.js';
import './styles.css';

const el = document.getElementById('root');
if (!el) throw new Error('missing #root element');
createRoot(el).render(<App />);
