/** The layering of ../shared/GUIDE.md: core ← db ← app, enforced in `npm test`. */
module.exports = {
  forbidden: [
    { name: 'core-is-pure', severity: 'error', comment: 'core/ imports nothing of db/ or app/',
      from: { path: '^core/' }, to: { path: '^(db|app)/' } },
    { name: 'core-no-node', severity: 'error', comment: 'core/ runs in the browser too: no Node built-ins',
      from: { path: '^core/' }, to: { dependencyTypes: ['core'] } },
    { name: 'db-not-app', severity: 'error', comment: 'db/ imports nothing of app/',
      from: { path: '^db/' }, to: { path: '^app/' } },
    { name: 'renderer-contract-only', severity: 'error',
      comment: 'the renderer talks to the backend only through app/api; it may use core/ for pure maths',
      from: { path: '^app/renderer/' }, to: { path: '^(db/|app/(main|preload|cli|server)/)' } },
    { name: 'preload-contract-only', severity: 'error', comment: 'the preload imports only the API contract',
      from: { path: '^app/preload/' }, to: { path: '^(db/|core/|app/(main|renderer|cli|server)/)' } },
    { name: 'no-circular', severity: 'error', from: {}, to: { circular: true } },
    { name: 'not-to-unresolvable', severity: 'error', from: {}, to: { couldNotResolve: true } },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.json' },
    enhancedResolveOptions: {
      extensions: ['.ts', '.js', '.mjs', '.svelte', '.json'],
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      mainFields: ['module', 'main', 'types'],
    },
    exclude: { path: 'node_modules' },
  },
};
