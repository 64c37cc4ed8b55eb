/**
 * Semver of the sizing engine. Bump it whenever any result can change, so a stored
 * estimate can be reproduced with the engine version it names.
 */
export const ENGINE_VERSION = '2.1.0';
