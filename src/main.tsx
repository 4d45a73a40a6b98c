import { render } from 'preact';
import { App } from './ui/App.tsx';
import './ui/styles.css';

render(<App />, document.getElementById('app')!);
