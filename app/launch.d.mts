/** Types of app/launch.mjs. */
export declare function bundleIsFresh(name: string, root?: string): boolean;
export declare function launch(name: string, entry: string, source: string): Promise<unknown>;
