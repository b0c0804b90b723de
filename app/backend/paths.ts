/**
 * Where Heatlag keeps its database and settings when no folder is given: the user's application-data
 * folder, the same one Electron's app.getPath('userData') gives for an app named "Heatlag".
 */
import { homedir } from 'node:os';
import path from 'node:path';

export const APP_FOLDER = 'Heatlag';
export const DATABASE_FILE = 'heatlag.db';
export const SETTINGS_FILE = 'settings.json';

export function defaultDataDir(env: NodeJS.ProcessEnv = process.env, platform: NodeJS.Platform = process.platform): string {
  if (platform === 'win32') {
    return path.join(env.APPDATA ?? path.join(homedir(), 'AppData', 'Roaming'), APP_FOLDER);
  }
  if (platform === 'darwin') {
    return path.join(homedir(), 'Library', 'Application Support', APP_FOLDER);
  }
  return path.join(env.XDG_CONFIG_HOME || path.join(homedir(), '.config'), APP_FOLDER);
}
