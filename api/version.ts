/** Release of the API (package version); kept here so the bundle needs no package.json at run time. */
export const API_VERSION = '0.1.0';
