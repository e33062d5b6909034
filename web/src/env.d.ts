/** Build-time constants and asset imports that esbuild resolves. */
declare const __BEATFORCE_VERSION__: string;
declare module '*.css';
