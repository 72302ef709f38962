/** Version of Hush itself (the add-in and the command line); tests/manifest.test.ts checks it against package.json and manifest.xml. */
export const APP_VERSION = '0.2.0';
