import { mount } from 'svelte';
import App from './App.svelte';
import { connectBackend } from './lib/backend.ts';
import { AppState } from './state/app.svelte.ts';
import './styles.css';

const app = new AppState(connectBackend());
mount(App, { target: document.getElementById('app')!, props: { app } });
void app.init();
