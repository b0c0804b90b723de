/**
 * The desktop preload exposes exactly one frozen object with one function per contract method (each
 * invoking only its own channel), the upload and the menu subscription, and never ipcRenderer itself.
 */
import { describe, expect, it, vi } from 'vitest';
import { IPC_PREFIX, IPC_UPLOAD, methodNames } from '../../app/api/contract.ts';

const exposed: Array<[string, unknown]> = [];
const invoke = vi.fn(async (..._args: unknown[]) => ({ ok: true, value: null }));
const on = vi.fn();

vi.mock('electron', () => ({
  contextBridge: { exposeInMainWorld: (key: string, value: unknown) => exposed.push([key, value]) },
  ipcRenderer: { invoke: (...args: unknown[]) => invoke(...args), on: (...args: unknown[]) => on(...args), removeListener: vi.fn() },
}));

describe('preload bridge', () => {
  it('exposes one frozen object named heatlag with the contract methods only', async () => {
    await import('../../app/preload/preload.ts');
    expect(exposed).toHaveLength(1);
    const [key, bridge] = exposed[0]! as [string, Record<string, unknown>];
    expect(key).toBe('heatlag');
    expect(Object.isFrozen(bridge)).toBe(true);
    expect(Object.keys(bridge).sort()).toEqual([...methodNames, 'upload', 'onMenu', 'kind'].sort());
    expect(JSON.stringify(Object.keys(bridge))).not.toContain('ipcRenderer');
    expect(bridge.kind).toBe('desktop');

    await (bridge.listSites as (i: unknown) => Promise<unknown>)({});
    expect(invoke).toHaveBeenLastCalledWith(`${IPC_PREFIX}listSites`, {});
    const bytes = new ArrayBuffer(4);
    await (bridge.upload as (n: string, b: ArrayBuffer) => Promise<unknown>)('log.csv', bytes);
    expect(invoke).toHaveBeenLastCalledWith(IPC_UPLOAD, 'log.csv', bytes);
  });

  it('passes only known menu commands to the renderer', async () => {
    const [, bridge] = exposed[0]! as [string, { onMenu(l: (c: string) => void): () => void }];
    const got: string[] = [];
    bridge.onMenu((c) => got.push(c));
    const handler = on.mock.calls[0]![1] as (e: unknown, c: unknown) => void;
    handler({}, 'import');
    handler({}, 'rm -rf');
    handler({}, 42);
    expect(got).toEqual(['import']);
  });
});
