/** Version of the add-in itself (src/plan/version.ts, checked against package.json by the tests). */
export { APP_VERSION } from '../plan/version';
