/** Types of app/bundle.mjs (the esbuild bundles of the CLI, server, Electron main and preload). */
export declare const BUNDLES: Record<'cli' | 'server' | 'main', { entries: Record<string, string>; splitting: boolean }>;
export declare function bundle(name: 'cli' | 'server' | 'main', root?: string): Promise<void>;
export declare function bundlePreload(root?: string): Promise<void>;
export declare function bundleAll(root?: string): Promise<void>;
