/** The application menu: the screens, import and about, with the usual edit and window roles. */
import { Menu, type BrowserWindow, type MenuItemConstructorOptions } from 'electron';
import { IPC_MENU, type MenuCommand } from '../api/bridge.ts';

export function buildMenu(win: BrowserWindow): Menu {
  const send = (command: MenuCommand) => () => win.webContents.send(IPC_MENU, command);
  const isMac = process.platform === 'darwin';
  const template: MenuItemConstructorOptions[] = [
    ...(isMac ? [{ role: 'appMenu' as const }] : []),
    {
      label: 'File',
      submenu: [
        { label: 'Import a log…', accelerator: 'CmdOrCtrl+O', click: send('import') },
        { type: 'separator' },
        isMac ? { role: 'close' } : { role: 'quit' },
      ],
    },
    { role: 'editMenu' },
    {
      label: 'View',
      submenu: [
        { label: 'Sites and zones', accelerator: 'CmdOrCtrl+1', click: send('sites') },
        { label: 'Zone history', accelerator: 'CmdOrCtrl+2', click: send('history') },
        { label: 'Response', accelerator: 'CmdOrCtrl+3', click: send('response') },
        { label: 'Recovery', accelerator: 'CmdOrCtrl+4', click: send('recovery') },
        { label: 'Quick estimate', accelerator: 'CmdOrCtrl+5', click: send('estimate') },
        { type: 'separator' },
        { role: 'resetZoom' },
        { role: 'zoomIn' },
        { role: 'zoomOut' },
        { type: 'separator' },
        { role: 'togglefullscreen' },
      ],
    },
    { role: 'windowMenu' },
    { role: 'help', submenu: [{ label: 'About Heatlag', click: send('about') }] },
  ];
  return Menu.buildFromTemplate(template);
}
