import pkg from '../../package.json';

/** The app version from package.json (written into reports and project files). */
export const APP_VERSION: string = pkg.version;
