import { mount } from 'svelte';
import App from './App.svelte';
import { connectBackend } from './lib/backend.ts';
import { AppState } from './state/app.svelte.ts';
import { parseReportSearch } from '../../api/report.ts';
import ReportPage from './report/ReportPage.svelte';
import './styles.css';

const target = document.getElementById('app')!;
// /?view=report&zone=…: the zone report alone, for printing (`heatlag report`); otherwise the app.
const reportRoute = parseReportSearch(window.location.search);
if (reportRoute) {
  mount(ReportPage, { target, props: { backend: connectBackend(), route: reportRoute } });
} else {
  const app = new AppState(connectBackend());
  mount(App, { target, props: { app } });
  void app.init();
}
