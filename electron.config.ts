/**
 * Packaging of the desktop app with electron-builder: installers for Linux (AppImage, .deb),
 * Windows (NSIS) and macOS (.dmg). Run on a machine with internet access (electron-builder downloads
 * the Electron runtime for each target and rebuilds better-sqlite3 for Electron's ABI):
 *
 *   npm run build && npx electron-builder --config electron.config.ts [--linux|--win|--mac]
 *
 * The packaged app loads better-sqlite3 from its own node_modules, rebuilt by the packager for
 * Electron (npmRebuild), so it needs no separate native folder; dist/native is for development only.
 */
import type { Configuration } from 'electron-builder';

const config: Configuration = {
  appId: 'app.heatlag.desktop',
  productName: 'Heatlag',
  copyright: 'Copyright © Heatlag contributors',
  electronVersion: '41.7.1',
  directories: { output: 'dist/installers' },
  extraMetadata: { main: 'app/main/entry.mjs' },
  files: [
    'package.json',
    'app/main/**',
    'app/api/**',
    'core/**',
    'db/**',
    'assets/demo/**',
    'dist/renderer/**',
    'dist/electron/**',
    '!**/*.map',
    '!**/*.test.ts',
  ],
  asar: true,
  asarUnpack: ['**/*.node'],
  npmRebuild: true,
  // Security fuses: the packaged binary cannot be turned into a plain Node runtime or debugged from
  // the command line, and loads only its own, integrity-checked app archive.
  electronFuses: {
    runAsNode: false,
    enableCookieEncryption: true,
    enableNodeOptionsEnvironmentVariable: false,
    enableNodeCliInspectArguments: false,
    enableEmbeddedAsarIntegrityValidation: true,
    onlyLoadAppFromAsar: true,
    grantFileProtocolExtraPrivileges: false,
  },
  linux: {
    target: ['AppImage', 'deb'],
    category: 'Science',
    synopsis: 'How fast a building zone loses and regains heat, from thermostat logs',
  },
  deb: { depends: ['libnss3', 'libgtk-3-0'] },
  win: { target: ['nsis'] },
  nsis: { oneClick: false, perMachine: false, allowToChangeInstallationDirectory: true },
  mac: { target: ['dmg'], category: 'public.app-category.productivity', hardenedRuntime: true },
};

export default config;
