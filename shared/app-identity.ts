// Names the app uses about itself, in one place for the CLI, the window and the page.

/** Replaced at build time by esbuild and by vitest (`define`) with package.json's version. */
declare const LAYLINE_VERSION: string;

export const APP_NAME = 'Layline';
export const APP_ID = 'org.layline.desktop';
export const APP_VERSION: string = LAYLINE_VERSION;
