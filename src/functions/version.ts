/** Version of the add-in itself, from package.json (the bundler keeps only the fields used). */
import pkg from '../../package.json';

export const APP_VERSION: string = pkg.version;
